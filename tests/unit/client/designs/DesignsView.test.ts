import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { DesignSummary } from '@/api/designs';
import type { User } from '@/api/types';
import DesignsView from '@/views/designs/DesignsView.vue';
import { designRow } from './designRow';

vi.mock('@/api/designs', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/designs')>()),
  listDesigns: vi.fn(),
  deleteDesign: vi.fn(),
}));
const api = await import('@/api/designs');

vi.setConfig({ testTimeout: 60_000 });

const DESIGNER: User = {
  id: 2,
  email: 'designer@example.test',
  name: 'Dana Designer',
  roles: ['designer'],
  disabled: false,
  isInvited: false,
  createdAt: '2026-01-01T00:00:00Z',
};

async function mountView(items: DesignSummary[]) {
  vi.mocked(api.listDesigns).mockResolvedValue({ items, total: items.length, page: 1, pageSize: 20 });
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/designs', component: DesignsView },
      { path: '/designs/:id', name: 'design-desk', component: { render: () => null } },
    ],
  });
  await router.push('/designs');
  const pinia = createTestingPinia({ createSpy: vi.fn, stubActions: false, initialState: { auth: { user: DESIGNER, isLoaded: true } } });
  const wrapper = mount(DesignsView, { global: { plugins: [router, pinia] }, attachTo: document.body });
  await flushPromises();
  return { wrapper };
}

describe('DesignsView', () => {
  beforeEach(() => {
    vi.mocked(api.listDesigns).mockReset();
    localStorage.clear();
  });

  it('when it opens, then it asks the server for the newest first and lists each design with status words and travel in mm', async () => {
    // Arrange / Act
    const { wrapper } = await mountView([
      designRow({ id: 1 }),
      designRow({ id: 2, name: 'Pen plotter', mechanism: 'hbot', status: 'in_review', canEdit: false, canDelete: false }),
    ]);
    // Assert
    expect(api.listDesigns).toHaveBeenCalledWith(expect.objectContaining({ page: 1, pageSize: 20, sort: '-updatedAt' }));
    const names = wrapper.findAll('[data-test="design-row"]').map((r) => r.text());
    expect(names).toEqual(['Bench stage', 'Pen plotter']);
    expect(wrapper.find('[data-test="status-in_review"]').text()).toBe('In review');
    expect(wrapper.text()).toContain('H-bot');
    // The travel values' code comes alongside the first page (here the answer is instant, so it may come after).
    await vi.waitFor(() => expect(wrapper.text()).toMatch(/312\s*mm\s*×\s*320\s*mm/));
    wrapper.unmount();
  });

  it('when the server says a listed design may not be opened, then its name is plain text saying why and it has no actions', async () => {
    // Arrange / Act: someone else's design in review, for a designer who does not review.
    const { wrapper } = await mountView([
      designRow({ id: 1 }),
      designRow({
        id: 3,
        name: 'Wide stage',
        status: 'in_review',
        owner: { id: 9, name: 'Tobiah' },
        canOpen: false,
        canEdit: false,
        canDelete: false,
      }),
    ]);
    // Assert
    const [open, closed] = wrapper.findAll('[data-test="design-row"]');
    expect(open.element.tagName).toBe('A');
    expect(closed.element.tagName).toBe('SPAN');
    expect(closed.get('[data-test="design-closed"]').text()).toBe('In review: reviewers only until approved');
    expect(wrapper.findAll('[data-test="design-actions"]')).toHaveLength(1);
    wrapper.unmount();
  });

  it('when the Name header is clicked, then the server sorts by name', async () => {
    const { wrapper } = await mountView([designRow({})]);
    vi.mocked(api.listDesigns).mockClear();
    // Act
    const nameHeader = wrapper.findAll('th').find((th) => th.text().startsWith('Name'))!;
    await nameHeader.trigger('click');
    await flushPromises();
    // Assert
    expect(api.listDesigns).toHaveBeenLastCalledWith(expect.objectContaining({ sort: 'name', page: 1 }));
    wrapper.unmount();
  });

  it('when there are no designs at all, then the empty state invites the designer to start one', async () => {
    const { wrapper } = await mountView([]);
    expect(wrapper.get('[data-test="empty-state"]').text()).toContain('No designs yet');
    expect(wrapper.find('[data-test="empty-new-design"]').exists()).toBe(true);
    wrapper.unmount();
  });

  it('when someone searches, then the query goes to the server after a pause, from page 1', async () => {
    const { wrapper } = await mountView([designRow({})]);
    vi.mocked(api.listDesigns).mockClear();
    await wrapper.get('input[data-test="designs-search"]').setValue('plotter');
    await vi.waitFor(() => expect(api.listDesigns).toHaveBeenCalledWith(expect.objectContaining({ q: 'plotter', page: 1 })));
    wrapper.unmount();
  });
});
