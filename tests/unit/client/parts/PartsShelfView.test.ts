import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { BeltPart } from '@/api/parts';
import type { Role, User } from '@/api/types';
import PartsShelfView from '@/views/parts/PartsShelfView.vue';

vi.mock('@/api/parts', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/parts')>()),
  listParts: vi.fn(),
  updatePart: vi.fn(),
  createPart: vi.fn(),
}));
const api = await import('@/api/parts');

vi.setConfig({ testTimeout: 60_000 });

const BELT: BeltPart = {
  id: 4,
  name: '2 mm round tooth 6 mm',
  profile: '2 mm round tooth',
  standard: '',
  pitchMm: 2,
  widthMm: 6,
  linearMassKgPerM: 0.0075,
  axialStiffnessN: 40000,
  allowableTensionN: 250,
  minPulleyTeeth: 12,
  note: 'Typical values for this belt size (common practice on desktop machines), not a datasheet — replace with the belt maker’s data.',
  retired: false,
};

async function mountShelf(roles: Role[]) {
  vi.mocked(api.listParts).mockResolvedValue([BELT]);
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/parts', component: PartsShelfView }] });
  await router.push('/parts');
  const user: User = {
    id: 9,
    email: 'x@example.test',
    name: 'X',
    roles,
    disabled: false,
    isInvited: false,
    createdAt: '2026-01-01T00:00:00Z',
  };
  const pinia = createTestingPinia({ createSpy: vi.fn, stubActions: false, initialState: { auth: { user, isLoaded: true } } });
  const wrapper = mount(PartsShelfView, { global: { plugins: [router, pinia] }, attachTo: document.body });
  await flushPromises();
  return { wrapper };
}

describe('PartsShelfView', () => {
  beforeEach(() => {
    vi.mocked(api.listParts).mockReset();
    localStorage.clear();
  });

  it('when a designer opens the shelf, then belts show with units and typical values are flagged, read only', async () => {
    // Arrange / Act
    const { wrapper } = await mountShelf(['designer']);
    // Assert
    expect(api.listParts).toHaveBeenCalledWith('belts', false);
    expect(wrapper.get('[data-test="part-row"]').text()).toBe('2 mm round tooth 6 mm');
    expect(wrapper.text()).toMatch(/7\.5\s*g\/m/);
    const note = wrapper.get('[data-test="part-note"]');
    expect(note.text()).toContain('Typical values');
    expect(note.classes()).toContain('parts__note--typical');
    expect(wrapper.find('[data-test="part-add"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="part-edit"]').exists()).toBe(false);
    expect(wrapper.text()).toContain('Read only');
    wrapper.unmount();
  });

  it('when an admin opens the shelf, then add, edit and retire are offered', async () => {
    const { wrapper } = await mountShelf(['admin']);
    expect(wrapper.get('[data-test="part-add"]').text()).toBe('Add a belt');
    expect(wrapper.find('[data-test="part-edit"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="part-retire"]').exists()).toBe(true);
    wrapper.unmount();
  });

  it('when the screen is phone-sized, then each part is a card with its figures and actions instead of a table (issue 13)', async () => {
    // Arrange: matchMedia answers "phone"
    const original = window.matchMedia;
    window.matchMedia = ((query: string) =>
      ({
        matches: query.includes('max-width: 640px'),
        media: query,
        addEventListener: () => {},
        removeEventListener: () => {},
      }) as unknown as MediaQueryList) as typeof window.matchMedia;
    try {
      // Act
      const { wrapper } = await mountShelf(['admin']);
      // Assert
      expect(wrapper.find('[data-test="parts-table-belts"]').exists()).toBe(false);
      const card = wrapper.get('[data-test="part-card"]');
      expect(card.text()).toContain('Allowable tension');
      expect(card.text()).toMatch(/250\s*N/);
      expect(card.find('[data-test="part-retire"]').exists()).toBe(true);
      wrapper.unmount();
    } finally {
      window.matchMedia = original;
    }
  });

  it('when "show retired" is switched on, then the shelf is asked again with retired parts', async () => {
    const { wrapper } = await mountShelf(['designer']);
    await wrapper.get('[data-test="parts-show-retired"]').trigger('click');
    await flushPromises();
    expect(api.listParts).toHaveBeenLastCalledWith('belts', true);
    wrapper.unmount();
  });
});
