import { beforeEach, describe, expect, it } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { defaultDesign, evaluateDesign, type DesignInput, type Mechanism } from '@/engine';
import { renderParts } from '@/format';
import { useUnitsStore } from '@/stores/units';
import DesignDeskDriveTab from '@/views/desk/DesignDeskDriveTab.vue';
import DesignDeskErrorTab from '@/views/desk/DesignDeskErrorTab.vue';
import DesignDeskJobTab from '@/views/desk/DesignDeskJobTab.vue';
import DesignDeskModesTab from '@/views/desk/DesignDeskModesTab.vue';

/** A real engine result as the fixture: the template design with a small map (and a job when given). */
function fixture(mech: Mechanism = 'corexy', edit: (d: DesignInput) => DesignInput = (d) => d) {
  const doc = edit({ ...defaultDesign(mech), map: { points: 11 } });
  return { doc, result: evaluateDesign(doc) };
}

const stubs = { global: { stubs: { BasePlot: true } } };

describe('DesignDeskErrorTab', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  it('when a result is shown, then the four terms, the total and the advice for the largest term appear', () => {
    // Arrange
    const { result } = fixture();
    // Act
    const wrapper = mount(DesignDeskErrorTab, { props: { result }, ...stubs });
    // Assert
    expect(wrapper.findAll('[data-test^="error-row-"]')).toHaveLength(4);
    expect(wrapper.get(`[data-test="error-row-${result.errorBudget.biggest.term}"]`).classes()).toContain('err__row--big');
    // The advice goes through the formatting layer: fine lengths in µm, as in the table above it.
    const advice = wrapper
      .get('[data-test="error-advice"]')
      .text()
      .replace(/\u00a0/g, ' ');
    expect(advice).toBe(renderParts(result.errorBudget.biggest.parts, 'metric').replace(/\u00a0/g, ' '));
    expect(advice).toMatch(/largest term \([\d.]+ µm\)/);
    const total = (result.errorBudget.worst.totalMm * 1000).toPrecision(3);
    expect(wrapper.get('[data-test="error-total"]').text()).toContain(`${Number(total)}`);
    expect(wrapper.get('[data-test="error-total"]').text()).toContain('µm');
  });

  it('when the units are imperial, then the errors show in thousandths of an inch', async () => {
    // Arrange
    const { result } = fixture();
    const wrapper = mount(DesignDeskErrorTab, { props: { result }, ...stubs });
    // Act
    useUnitsStore().setSystem('imperial');
    await flushPromises();
    // Assert
    expect(wrapper.get('[data-test="error-total"]').text()).toContain('thou');
  });
});

describe('DesignDeskModesTab', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  it('when a crossed-belt result is shown, then every mode is listed, the lowest first, with the shaper times', () => {
    const { result } = fixture();
    const wrapper = mount(DesignDeskModesTab, { props: { result }, ...stubs });
    const rows = wrapper.findAll('[data-test^="mode-"]').filter((r) => r.element.tagName === 'TR');
    expect(rows.map((r) => r.attributes('data-test'))).toEqual(result.modes.map((m) => `mode-${m.id}`));
    expect(rows[0].classes()).toContain('modes__row--low');
    expect(wrapper.get('[data-test="shaping"]').text()).toContain(`${Number((result.shaping.zvDurationS * 1000).toPrecision(3))}ms`);
  });

  it('when the H-belt leaves yaw to the guides, then the tab says so', () => {
    const { result } = fixture('hbot');
    const wrapper = mount(DesignDeskModesTab, { props: { result }, ...stubs });
    expect(wrapper.get('[data-test="mode-not-held-gantry-yaw"]').text()).toMatch(/slide along X/);
  });

  it('when the gantry beam is left to typical values, then the tab names them as typical', () => {
    const { result } = fixture();
    const wrapper = mount(DesignDeskModesTab, { props: { result }, ...stubs });
    expect(wrapper.get('[data-test="modes-beam"]').text()).toContain('typical values for a 20 × 20 mm profile');
  });
});

describe('DesignDeskDriveTab', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  it('when a cartesian stage with two Y motors is shown, then heat lists three motors and loads every pulley', () => {
    const { result } = fixture('cartesian', (d) => ({ ...d, yMotors: 2 }));
    const wrapper = mount(DesignDeskDriveTab, { props: { result, pitchMm: 2 }, ...stubs });
    expect(wrapper.findAll('[data-test="heat-table"] tbody tr')).toHaveLength(3);
    expect(wrapper.findAll('[data-test="loads-table"] tbody tr')).toHaveLength(result.loads.pulleys.length);
    expect(wrapper.get('[data-test="supply"]').text()).toContain('V');
  });

  it('when the controller is slower than the cruise needs, then the microstep rate is flagged over', () => {
    const { result } = fixture('corexy', (d) => ({ ...d, controller: { maxStepRateHz: 10000, jerkMmPerS3: null } }));
    const wrapper = mount(DesignDeskDriveTab, { props: { result, pitchMm: 2 }, ...stubs });
    expect(wrapper.get('[data-test="step-rates"]').text()).toContain('over');
  });
});

describe('DesignDeskJobTab', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  const job = {
    points: [
      { xMm: 10, yMm: 10, dwellS: 0.2 },
      { xMm: 120, yMm: 40, dwellS: 0 },
      { xMm: 60, yMm: 200, dwellS: 0 },
    ],
  };

  it('when the design has a job, then the points, the cycle time and the moves show', () => {
    // Arrange
    const { doc, result } = fixture('corexy', (d) => ({ ...d, job }));
    // Act
    const wrapper = mount(DesignDeskJobTab, { props: { result, model: doc, isReadOnly: false, isActive: false }, ...stubs });
    // Assert
    expect(wrapper.findAll('[data-test="job-points"] tbody tr')).toHaveLength(3);
    expect(wrapper.findAll('[data-test="job-moves"] tbody tr')).toHaveLength(2);
    expect(wrapper.get('[data-test="job-total"]').text()).toContain(`${Number(result.job!.totalS!.toPrecision(4))}`);
  });

  it('when a coordinate is typed, then the whole job is emitted with the new value', async () => {
    // Arrange
    const { doc, result } = fixture('corexy', (d) => ({ ...d, job }));
    const wrapper = mount(DesignDeskJobTab, { props: { result, model: doc, isReadOnly: false, isActive: false }, ...stubs });
    // Act
    await wrapper.get('input[aria-label="Point 2 Y"]').setValue('55');
    // Assert
    const [path, value] = wrapper.emitted('set')!.at(-1)!;
    expect(path).toBe('job');
    expect(value).toEqual({ points: [job.points[0], { xMm: 120, yMm: 55, dwellS: 0 }, job.points[2]] });
  });

  it('when a point is added to an empty job, then a first point at the origin is emitted', async () => {
    const { doc, result } = fixture();
    const wrapper = mount(DesignDeskJobTab, { props: { result, model: doc, isReadOnly: false, isActive: false }, ...stubs });
    expect(wrapper.find('[data-test="job-empty"]').exists()).toBe(true);
    await wrapper.get('[data-test="job-add"]').trigger('click');
    expect(wrapper.emitted('set')!.at(-1)).toEqual(['job', { points: [{ xMm: 0, yMm: 0, dwellS: 0 }] }]);
  });

  it('when a CSV file is chosen, then it is handed up for upload, and reported problems show with their lines', async () => {
    // Arrange
    const { doc, result } = fixture();
    const wrapper = mount(DesignDeskJobTab, {
      props: {
        result,
        model: doc,
        isReadOnly: false,
        isActive: false,
        uploadProblems: [{ where: 'line 3, x:', message: '"abc" is not a number' }],
      },
      ...stubs,
    });
    const file = new File(['x,y\n1,2\n'], 'job.csv', { type: 'text/csv' });
    const input = wrapper.get('[data-test="job-file"]');
    Object.defineProperty(input.element, 'files', { value: [file] });
    // Act
    await input.trigger('change');
    // Assert
    expect(wrapper.emitted('upload')![0]).toEqual([file]);
    expect(wrapper.get('[data-test="job-upload-problems"]').text()).toContain('line 3, x: "abc" is not a number');
  });

  it('when the design is read-only, then nothing can be typed or uploaded', () => {
    const { doc, result } = fixture('corexy', (d) => ({ ...d, job }));
    const wrapper = mount(DesignDeskJobTab, { props: { result, model: doc, isReadOnly: true, isActive: false }, ...stubs });
    expect(wrapper.get('[data-test="job-upload"]').attributes('disabled')).toBeDefined();
    expect(wrapper.get('input[aria-label="Point 1 X"]').attributes('disabled')).toBeDefined();
  });

  it('when the tab is active, then the same job is timed on all three mechanisms', async () => {
    const { doc, result } = fixture('corexy', (d) => ({ ...d, job }));
    const wrapper = mount(DesignDeskJobTab, { props: { result, model: doc, isReadOnly: false, isActive: true }, ...stubs });
    await flushPromises();
    await new Promise((r) => setTimeout(r, 20));
    await flushPromises();
    const rows = wrapper.findAll('[data-test="job-compare"] tbody tr');
    expect(rows).toHaveLength(3);
    expect(rows.map((r) => r.text()).join(' ')).toMatch(/CoreXY.*H-bot.*Cartesian/s);
    // plan total, at-limits total and its moving time per mechanism
    expect(rows[0].findAll('td')).toHaveLength(3);
    expect(rows[0].findAll('td')[2].text()).toMatch(/\d.*s/);
  });
});
