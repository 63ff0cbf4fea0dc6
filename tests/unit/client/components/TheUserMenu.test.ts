import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import { ElMessageBox } from 'element-plus';
import * as authApi from '@/api/auth';
import { useAuthStore } from '@/stores/auth';
import TheUserMenu from '@/components/TheUserMenu.vue';

vi.mock('@/api/auth', () => ({ listSessions: vi.fn(), endSession: vi.fn(), signOutEverywhere: vi.fn(), logout: vi.fn() }));
const api = vi.mocked(authApi);

async function mountMenu() {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: { render: () => null } },
      { path: '/sign-in', name: 'sign-in', component: { render: () => null } },
    ],
  });
  await router.push('/');
  const pinia = createTestingPinia({
    createSpy: vi.fn,
    stubActions: false,
    initialState: {
      auth: {
        user: {
          id: 3,
          email: 'maren@example.test',
          name: 'Maren Q',
          roles: ['designer'],
          disabled: false,
          createdAt: '2026-01-01T00:00:00Z',
        },
        isLoaded: true,
      },
    },
  });
  const wrapper = mount(TheUserMenu, { global: { plugins: [router, pinia] }, attachTo: document.body });
  return { wrapper, router, auth: useAuthStore(pinia) };
}

describe('TheUserMenu', () => {
  it('when "Sign out everywhere" is chosen and confirmed, then every session ends on the server and the page goes to sign-in', async () => {
    // Arrange
    api.signOutEverywhere.mockResolvedValue(undefined);
    vi.spyOn(ElMessageBox, 'confirm').mockResolvedValue('confirm' as never);
    const { wrapper, router, auth } = await mountMenu();
    // Act
    await wrapper.get('[data-test="user-menu"]').trigger('click');
    await flushPromises();
    (document.querySelector('[data-test="sign-out-everywhere-menu"]') as HTMLElement).click();
    await flushPromises();
    // Assert
    expect(api.signOutEverywhere).toHaveBeenCalledTimes(1);
    expect(auth.user).toBeNull();
    expect(router.currentRoute.value.name).toBe('sign-in');
    wrapper.unmount();
  });

  it('when "Active sessions" is chosen, then the sessions dialog opens and asks the server for the list', async () => {
    // Arrange
    api.listSessions.mockResolvedValue({ items: [], total: 0, page: 1, pageSize: 1 });
    const { wrapper } = await mountMenu();
    // Act
    await wrapper.get('[data-test="user-menu"]').trigger('click');
    await flushPromises();
    (document.querySelector('[data-test="open-sessions"]') as HTMLElement).click();
    // The dialog's code is fetched on this first opening.
    await vi.waitFor(() => expect(document.querySelector('[data-test="sessions-dialog"]')).not.toBeNull());
    await flushPromises();
    // Assert
    expect(api.listSessions).toHaveBeenCalledTimes(1);
    wrapper.unmount();
  });
});
