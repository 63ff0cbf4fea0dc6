import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import type { SpanSummary } from '@/api/measurements';
import MeasurementForm from '@/components/measurements/MeasurementForm.vue';
import MeasurementSpectrum from '@/components/measurements/MeasurementSpectrum.vue';

vi.setConfig({ testTimeout: 60_000 });

const SPANS: SpanSummary[] = [
  {
    spanId: 'a-front',
    beltId: 'a',
    beltLabel: 'Belt A',
    label: 'A front span',
    lengthMm: 300,
    fixedLength: false,
    isReference: false,
    targetFrequencyHz: 120,
    targetBandHz: { low: 120 * Math.sqrt(0.9), high: 120 * Math.sqrt(1.1) },
    targetTensionN: 48,
    latest: null,
    count: 0,
    status: 'unmeasured',
  },
  {
    spanId: 'a-back',
    beltId: 'a',
    beltLabel: 'Belt A',
    label: 'A back span',
    lengthMm: 400,
    fixedLength: true,
    isReference: true,
    targetFrequencyHz: 100,
    targetBandHz: { low: 100 * Math.sqrt(0.9), high: 100 * Math.sqrt(1.1) },
    targetTensionN: 48,
    latest: null,
    count: 0,
    status: 'unmeasured',
  },
];

function mountForm(props: { error?: string } = {}) {
  return mount(MeasurementForm, { props: { spans: SPANS, ...props }, attachTo: document.body });
}

/** Puts a file in the upload's hidden input, as the browser does when one is chosen. */
async function chooseFile(wrapper: ReturnType<typeof mountForm>, file: File) {
  const input = wrapper.get<HTMLInputElement>('input[type="file"]');
  Object.defineProperty(input.element, 'files', { value: [file], configurable: true });
  await input.trigger('change');
  await flushPromises();
}

describe('MeasurementForm', () => {
  it('when no span is chosen yet, then the reference span is preselected and its target is shown', async () => {
    const wrapper = mountForm();
    await flushPromises();
    expect(wrapper.emitted('update:spanId')).toEqual([['a-back']]);
    expect(wrapper.text()).toContain('target 100.0 Hz');
    wrapper.unmount();
  });

  it('when the parent passes an API error, then it is shown in the form', () => {
    const wrapper = mountForm({ error: 'No clear tone found: pluck closer to the microphone.' });
    expect(wrapper.get('[data-test="measurement-error"]').text()).toContain('No clear tone found: pluck closer to the microphone.');
    wrapper.unmount();
  });

  it('when a WAV recording is chosen, then submit emits it with the selected span', async () => {
    // Arrange
    const wrapper = mountForm();
    await wrapper.get('[data-test="measurement-mode-recording"] input').setValue(true);
    await flushPromises();
    const wav = new File([new Uint8Array(1024)], 'pluck.wav', { type: 'audio/wav' });
    // Act
    await chooseFile(wrapper, wav);
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    // Assert
    const entries = wrapper.emitted('submit') as [{ spanId: string; mode: string; file: File }][];
    expect(entries).toHaveLength(1);
    expect(entries[0][0]).toMatchObject({ spanId: 'a-back', mode: 'recording' });
    expect(entries[0][0].file.name).toBe('pluck.wav');
    wrapper.unmount();
  });

  it('when the recording is larger than 2 MB, then says so and does not submit', async () => {
    // Arrange
    const wrapper = mountForm();
    await wrapper.get('[data-test="measurement-mode-recording"] input').setValue(true);
    await flushPromises();
    const big = new File([new Uint8Array(2 * 1024 * 1024 + 1)], 'long.wav', { type: 'audio/wav' });
    // Act
    await chooseFile(wrapper, big);
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    // Assert
    expect(wrapper.get('[data-test="measurement-error"]').text()).toContain('at most 2 MB');
    expect(wrapper.emitted('submit')).toBeUndefined();
    wrapper.unmount();
  });
});

describe('MeasurementSpectrum', () => {
  it('when drawn, then the found and target frequencies are marked and the axis spans six times the higher of them', () => {
    // Arrange / Act
    const wrapper = mount(MeasurementSpectrum, {
      props: {
        spectrum: { frequencyHz: [0, 250, 500, 750, 1000, 2000], magnitudeDb: [-80, -40, -10, -30, -50, -70] },
        frequencyHz: 92.5,
        targetFrequencyHz: 100,
      },
      global: { stubs: { BasePlot: true } },
    });
    // Assert
    const plot = wrapper.getComponent({ name: 'BasePlot' });
    const layout = plot.props('layout') as { shapes: { x0: number }[]; annotations: { text: string }[]; xaxis: { range: number[] } };
    expect(layout.shapes.map((s) => s.x0)).toEqual([92.5, 100]);
    expect(layout.annotations.map((a) => a.text)).toEqual(['found 92.5 Hz', 'target 100.0 Hz']);
    expect(layout.xaxis.range).toEqual([0, 600]);
    expect(plot.props('description')).toContain('fundamental found at 92.5 Hz, target 100.0 Hz');
    wrapper.unmount();
  });

  it('when the spectrum ends below six harmonics, then the axis stops at its last point', () => {
    const wrapper = mount(MeasurementSpectrum, {
      props: { spectrum: { frequencyHz: [0, 100, 400], magnitudeDb: [-80, -10, -60] }, frequencyHz: 100, targetFrequencyHz: 100 },
      global: { stubs: { BasePlot: true } },
    });
    expect((wrapper.getComponent({ name: 'BasePlot' }).props('layout') as { xaxis: { range: number[] } }).xaxis.range).toEqual([0, 400]);
    wrapper.unmount();
  });
});
