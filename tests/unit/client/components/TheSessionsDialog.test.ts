import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import { ElMessageBox } from 'element-plus';
import * as authApi from '@/api/auth';
import type { SessionInfo } from '@/api/types';
import { useAuthStore } from '@/stores/auth';
import TheSessionsDialog from '@/components/TheSessionsDialog.vue';

vi.mock('@/api/auth', () => ({ listSessions: vi.fn(), endSession: vi.fn(), signOutEverywhere: vi.fn() }));
const api = vi.mocked(authApi);

const session = (id: number, over: Partial<SessionInfo> = {}): SessionInfo => ({
  id,
  createdAt: '2026-12-04T08:00:00Z',
  lastSeenAt: '2026-12-04T09:30:00Z',
  expiresAt: '2026-12-04T20:00:00Z',
  userAgent: 'Firefox on Linux',
  ip: '192.0.2.7',
  isCurrent: false,
  ...over,
});

async function mountDialog() {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: { render: () => null } },
      { path: '/sign-in', name: 'sign-in', component: { render: () => null } },
    ],
  });
  await router.push('/');
  const pinia = createTestingPinia({ createSpy: vi.fn, stubActions: false });
  const wrapper = mount(TheSessionsDialog, { props: { modelValue: true }, global: { plugins: [router, pinia] }, attachTo: document.body });
  await flushPromises();
  return { wrapper, router, auth: useAuthStore(pinia) };
}

const rows = () => [...document.querySelectorAll('[data-test="session-row"]')];

describe('TheSessionsDialog', () => {
  beforeEach(() => {
    vi.resetAllMocks();
    document.body.innerHTML = '';
  });

  it('when opened, then lists each open session with its client, address and times, marking this browser', async () => {
    // Arrange
    api.listSessions.mockResolvedValue({
      items: [session(1, { isCurrent: true, userAgent: 'Chrome on macOS' }), session(2)],
      total: 2,
      page: 1,
      pageSize: 2,
    });
    // Act
    const { wrapper } = await mountDialog();
    // Assert
    expect(rows()).toHaveLength(2);
    expect(rows()[0].querySelector('[data-test="session-client"]')!.textContent).toBe('Chrome on macOS');
    expect(rows()[0].querySelector('[data-test="session-current"]')!.textContent).toBe('This browser');
    expect(rows()[0].querySelector('[data-test="session-end"]')).toBeNull();
    expect(rows()[1].textContent).toContain('192.0.2.7');
    expect(rows()[1].querySelector('[data-test="session-end"]')).not.toBeNull();
    wrapper.unmount();
  });

  it('when another session is signed out, then the server is asked to end it and it leaves the list', async () => {
    // Arrange
    api.listSessions.mockResolvedValue({ items: [session(1, { isCurrent: true }), session(2)], total: 2, page: 1, pageSize: 2 });
    api.endSession.mockResolvedValue(undefined);
    const { wrapper } = await mountDialog();
    // Act
    (rows()[1].querySelector('[data-test="session-end"]') as HTMLButtonElement).click();
    await flushPromises();
    // Assert
    expect(api.endSession).toHaveBeenCalledWith(2);
    expect(rows()).toHaveLength(1);
    wrapper.unmount();
  });

  it('when "Sign out everywhere" is confirmed, then every session ends on the server and the page goes to sign-in', async () => {
    // Arrange
    api.listSessions.mockResolvedValue({ items: [session(1, { isCurrent: true })], total: 1, page: 1, pageSize: 1 });
    api.signOutEverywhere.mockResolvedValue(undefined);
    vi.spyOn(ElMessageBox, 'confirm').mockResolvedValue('confirm' as never);
    const { wrapper, router, auth } = await mountDialog();
    // Act
    (document.querySelector('[data-test="sign-out-everywhere"]') as HTMLButtonElement).click();
    await flushPromises();
    // Assert
    expect(api.signOutEverywhere).toHaveBeenCalledTimes(1);
    expect(auth.user).toBeNull();
    expect(router.currentRoute.value.name).toBe('sign-in');
    wrapper.unmount();
  });

  it('when "Sign out everywhere" is cancelled, then nothing is ended', async () => {
    // Arrange
    api.listSessions.mockResolvedValue({ items: [session(1, { isCurrent: true })], total: 1, page: 1, pageSize: 1 });
    vi.spyOn(ElMessageBox, 'confirm').mockRejectedValue('cancel');
    const { wrapper, router } = await mountDialog();
    // Act
    (document.querySelector('[data-test="sign-out-everywhere"]') as HTMLButtonElement).click();
    await flushPromises();
    // Assert
    expect(api.signOutEverywhere).not.toHaveBeenCalled();
    expect(router.currentRoute.value.path).toBe('/');
    wrapper.unmount();
  });
});
