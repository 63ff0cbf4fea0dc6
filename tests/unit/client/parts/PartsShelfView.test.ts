import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { BeltPart, MotorPart } from '@/api/parts';
import type { Role, User } from '@/api/types';
import PartsShelfView from '@/views/parts/PartsShelfView.vue';

vi.mock('@/api/parts', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/parts')>()),
  listParts: vi.fn(),
  updatePart: vi.fn(),
  createPart: vi.fn(),
}));
const api = await import('@/api/parts');
vi.mock('@/api/attachments', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/attachments')>()),
  getTorqueCurve: vi.fn(),
}));
const attachmentsApi = await import('@/api/attachments');

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

const MOTOR: MotorPart = {
  id: 7,
  name: '42 mm 0.45 N·m',
  frameMm: 42,
  stepAngleDeg: 1.8,
  holdingTorqueNm: 0.45,
  ratedCurrentA: 1.5,
  phaseResistanceOhm: 1.65,
  phaseInductanceMh: 2.8,
  rotorInertiaKgM2: 5.4e-6,
  massKg: 0.28,
  torqueCurve: null,
  torqueCurveConditions: null,
  note: '',
  retired: false,
};

async function mountShelf(roles: Role[], shelf: 'belts' | 'motors' = 'belts', belts: BeltPart[] = [BELT], motors: MotorPart[] = [MOTOR]) {
  vi.mocked(api.listParts).mockResolvedValue(shelf === 'motors' ? motors : belts);
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/parts', component: PartsShelfView }] });
  await router.push(shelf === 'motors' ? '/parts?shelf=motors' : '/parts');
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
  // The torque dialog's plot needs a real browser (plotly); its data is the dialog's business, not the shelf's.
  const wrapper = mount(PartsShelfView, {
    global: { plugins: [router, pinia], stubs: { TorqueTablePlot: true } },
    attachTo: document.body,
  });
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

  it('when several parts carry the same note, then it is said once above the list and their rows show a short marker', async () => {
    // Arrange: two belts with the typical-values note, one with a note of its own.
    const own = 'Bought from the local supplier; check the pitch line.';
    const belts = [
      BELT,
      { ...BELT, id: 5, name: '2 mm round tooth 10 mm', widthMm: 10 },
      { ...BELT, id: 6, name: 'Steel-cord 6 mm', note: own },
    ];
    // Act
    const { wrapper } = await mountShelf(['designer'], 'belts', belts);
    // Assert
    const shared = wrapper.get('[data-test="parts-shared-note"]');
    expect(shared.text()).toContain(BELT.note);
    expect(shared.classes()).toContain('parts__note--typical');
    const notes = wrapper.findAll('[data-test="part-note"]');
    expect(notes.map((n) => n.text())).toEqual(['!Typical values', '!Typical values', own]);
    expect(notes[0].attributes('title')).toBe(BELT.note);
    expect(notes[2].attributes('title')).toBeUndefined();
    expect(wrapper.text().split(BELT.note).length - 1).toBe(1);
    wrapper.unmount();
  });

  it('when parts share a note that is not about typical values, then it is lifted with how many share it', async () => {
    const note = 'Generic size; inertia left empty.';
    const belts = [
      { ...BELT, note },
      { ...BELT, id: 5, name: 'Other', note },
    ];
    const { wrapper } = await mountShelf(['designer'], 'belts', belts);
    const shared = wrapper.get('[data-test="parts-shared-note"]');
    expect(shared.text()).toBe(`Note shared by 2 parts: ${note}`);
    expect(shared.classes()).not.toContain('parts__note--typical');
    expect(wrapper.findAll('[data-test="part-note"]').map((n) => n.text())).toEqual(['Shared note (above)', 'Shared note (above)']);
    wrapper.unmount();
  });

  it('when every part has a note of its own, then no note is lifted above the list', async () => {
    const { wrapper } = await mountShelf(['designer']);
    expect(wrapper.find('[data-test="parts-shared-note"]').exists()).toBe(false);
    expect(wrapper.get('[data-test="part-note"]').text()).toContain(BELT.note);
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

  it('when an admin clicks Edit, then the dialog (loaded on that first opening) shows the part’s values', async () => {
    // Arrange
    const { wrapper } = await mountShelf(['admin']);
    expect(document.querySelector('[data-test="part-dialog"]')).toBeNull();
    // Act
    await wrapper.get('[data-test="part-edit"]').trigger('click');
    // Assert
    await vi.waitFor(() => expect(document.querySelector('[data-test="part-dialog"]')).not.toBeNull());
    await flushPromises();
    const name = document.querySelector<HTMLInputElement>('[data-test="part-dialog"] [data-test="part-field-name"] input');
    expect(name?.value).toBe(BELT.name);
    wrapper.unmount();
  });

  it('when someone opens a motor’s torque table, then the dialog (loaded on that first opening) asks the server for the table', async () => {
    // Arrange
    vi.mocked(attachmentsApi.getTorqueCurve).mockResolvedValue({
      motor: { ...MOTOR, shelf: 'motors', createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-01T00:00:00Z' },
      file: null,
    });
    const { wrapper } = await mountShelf(['designer'], 'motors');
    expect(document.querySelector('[data-test="torque-dialog"]')).toBeNull();
    // Act
    await wrapper.get(`[data-test="torque-table-open-${MOTOR.id}"]`).trigger('click');
    // Assert
    await vi.waitFor(() => expect(document.querySelector('[data-test="torque-dialog"] [data-test="torque-status"]')).not.toBeNull());
    await flushPromises();
    expect(attachmentsApi.getTorqueCurve).toHaveBeenCalledWith(MOTOR.id);
    expect(document.querySelector('[data-test="torque-status"]')?.textContent).toContain('No table uploaded');
    wrapper.unmount();
  });

  it('when a motor has a measured torque table, then its button says how many points it has (no separate tag)', async () => {
    // Arrange
    const measured: MotorPart = {
      ...MOTOR,
      id: 8,
      name: 'Measured 42 mm',
      torqueCurve: [
        { speedRevPerS: 0, torqueNm: 0.45 },
        { speedRevPerS: 10, torqueNm: 0.38 },
        { speedRevPerS: 20, torqueNm: 0.25 },
      ],
    };
    // Act
    const { wrapper } = await mountShelf(['designer'], 'motors', [BELT], [MOTOR, measured]);
    // Assert
    expect(wrapper.get(`[data-test="torque-table-open-${MOTOR.id}"]`).text()).toBe('Torque table');
    expect(wrapper.get(`[data-test="torque-table-open-${measured.id}"]`).text()).toBe('Torque table · 3 points');
    expect(wrapper.find('.parts__curve-tag').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when "show retired" is switched on, then the shelf is asked again with retired parts', async () => {
    const { wrapper } = await mountShelf(['designer']);
    await wrapper.get('[data-test="parts-show-retired"]').trigger('click');
    await flushPromises();
    expect(api.listParts).toHaveBeenLastCalledWith('belts', true);
    wrapper.unmount();
  });
});
