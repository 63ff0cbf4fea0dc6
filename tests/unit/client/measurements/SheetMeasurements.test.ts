import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import type { Measurement, MeasurementDetail, SheetMeasurements as SheetMeasurementsData, SpanSummary } from '@/api/measurements';
import SheetMeasurements from '@/components/measurements/SheetMeasurements.vue';

vi.mock('@/utils/message', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/utils/message')>()),
  showSuccess: vi.fn(),
}));

vi.setConfig({ testTimeout: 60_000 });

// The real API module and HTTP client run; only the network (fetch) is replaced, so the request body the
// server would receive is what these tests check.
const fetchMock = vi.fn<typeof fetch>();

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

function measurement(extra: Partial<Measurement> = {}): Measurement {
  return {
    id: 71,
    sheetId: 5,
    spanId: 'a-back',
    beltId: 'a',
    spanLengthMm: 400,
    linearMassKgPerM: 0.0075,
    frequencyHz: 110,
    tensionN: 58.08,
    targetFrequencyHz: 100,
    targetTensionN: 48,
    deviationPct: 21,
    source: 'typed',
    confidence: null,
    hasSpectrum: false,
    recording: null,
    measuredBy: { id: 8, name: 'Max Maker' },
    measuredAt: '2026-03-04T11:00:00Z',
    ...extra,
  };
}

function span(spanId: string, beltId: 'a' | 'b', extra: Partial<SpanSummary> = {}): SpanSummary {
  return {
    spanId,
    beltId,
    beltLabel: beltId === 'a' ? 'Belt A' : 'Belt B',
    label: `${beltId.toUpperCase()} ${spanId.endsWith('back') ? 'back' : 'front'} span`,
    lengthMm: 400,
    fixedLength: true,
    isReference: spanId.endsWith('back'),
    targetFrequencyHz: 100,
    targetBandHz: { low: 100 * Math.sqrt(0.9), high: 100 * Math.sqrt(1.1) },
    targetTensionN: 48,
    latest: null,
    count: 0,
    status: 'unmeasured',
    ...extra,
  };
}

function summary(extra: Partial<SheetMeasurementsData> = {}): SheetMeasurementsData {
  const a = measurement();
  const b = measurement({ id: 72, spanId: 'b-back', beltId: 'b', frequencyHz: 92, tensionN: 40.63, deviationPct: -15.35 });
  return {
    items: [b, a],
    total: 2,
    page: 1,
    pageSize: 50,
    sheetId: 5,
    mechanism: 'corexy',
    spans: [
      span('a-front', 'a'),
      span('a-back', 'a', { latest: a, count: 1, status: 'high' }),
      span('b-back', 'b', { latest: b, count: 1, status: 'low' }),
    ],
    pairs: [
      {
        spanIds: ['a-back', 'b-back'],
        labels: ['Belt A back', 'Belt B back'],
        tensionsN: [58.08, 40.63],
        differencePct: 35.37,
        isMismatch: true,
      },
    ],
    tolerances: { crossedBeltPct: 5, targetPct: 10, source: 'common practice' },
    allowableTensionN: 250,
    canRecord: true,
    ...extra,
  };
}

function detail(m: Measurement): MeasurementDetail {
  return { ...m, spectrum: null };
}

/** Answers the measurement endpoints of sheet 5; `onPost` decides the answer to a new measurement. */
function serve(data: SheetMeasurementsData, onPost?: (body: unknown) => Response) {
  fetchMock.mockImplementation(async (input, init) => {
    const url = String(input);
    const method = init?.method ?? 'GET';
    if (method === 'GET' && url === '/api/sheets/5/measurements') return json(200, data);
    const one = /^\/api\/sheets\/5\/measurements\/(\d+)$/.exec(url);
    if (method === 'GET' && one) return json(200, detail(data.items.find((m) => m.id === Number(one[1])) ?? data.items[0]));
    if (method === 'POST' && url === '/api/sheets/5/measurements' && onPost) return onPost(JSON.parse(String(init?.body)));
    return json(404, { error: { code: 'not_found', message: `Unexpected ${method} ${url}` } });
  });
}

async function mountSection() {
  const wrapper = mount(SheetMeasurements, {
    props: { sheetId: 5 },
    global: { stubs: { MeasurementSpectrum: true } },
    attachTo: document.body,
  });
  await flushPromises();
  return wrapper;
}

async function typeFrequency(wrapper: Awaited<ReturnType<typeof mountSection>>, value: string) {
  const input = wrapper.get('[data-test="measurement-frequency"] input');
  await input.setValue(value);
  await input.trigger('change');
  await flushPromises();
}

const row = (wrapper: Awaited<ReturnType<typeof mountSection>>, spanId: string) =>
  wrapper.get(`[data-test="measurement-row"][data-span="${spanId}"]`);

describe('SheetMeasurements', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    localStorage.clear();
    fetchMock.mockReset();
    vi.stubGlobal('fetch', fetchMock);
    // jsdom has no layout, so no scrollIntoView; "Record" scrolls the form into view.
    Element.prototype.scrollIntoView = vi.fn();
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('when the summary is loaded, then each span shows its target against the measured value and status', async () => {
    // Arrange
    serve(summary());
    // Act
    const wrapper = await mountSection();
    // Assert
    const a = row(wrapper, 'a-back');
    expect(a.text()).toContain('100.0 Hz');
    expect(a.text()).toContain('good 94.9–104.9');
    expect(a.get('[data-test="measured-frequency"]').text()).toBe('110 Hz');
    expect(a.get('[data-test="target-tension"]').text()).toMatch(/^48\s*N$/);
    expect(a.get('[data-test="measured-tension"]').text()).toMatch(/^58\.08\s*N$/);
    expect(a.get('[data-test="measured-deviation"]').text()).toBe('+21\u00a0%');
    expect(a.attributes('data-status')).toBe('high');
    expect(a.text()).toContain('too tight');
    expect(row(wrapper, 'b-back').get('[data-test="measured-deviation"]').text()).toBe('−15\u00a0%'); // two significant digits
    expect(row(wrapper, 'b-back').text()).toContain('too slack');
    const front = row(wrapper, 'a-front');
    expect(front.get('[data-test="measured-frequency"]').text()).toBe('—');
    expect(front.text()).toContain('not measured');
    expect(wrapper.text()).toContain('2 of 3 spans measured.');
    wrapper.unmount();
  });

  it('when the crossed belts disagree, then the mismatch flag names both tensions and both rows are marked', async () => {
    serve(summary());
    const wrapper = await mountSection();
    const flags = wrapper.findAll('[data-test="mismatch-flag"]');
    expect(flags).toHaveLength(1);
    expect(flags[0].text()).toContain('disagree by 35 %');
    expect(flags[0].text()).toContain('more than 5 %');
    expect(flags[0].text()).toMatch(/Belt A back: 58\.08\s*N/);
    expect(flags[0].text()).toMatch(/Belt B back: 40\.63\s*N/);
    expect(row(wrapper, 'a-back').classes()).toContain('meas__row--mismatch');
    expect(row(wrapper, 'b-back').classes()).toContain('meas__row--mismatch');
    expect(row(wrapper, 'a-front').classes()).not.toContain('meas__row--mismatch');
    wrapper.unmount();
  });

  it('when the crossed belts agree, then no mismatch is flagged', async () => {
    const data = summary();
    serve({ ...data, pairs: [{ ...data.pairs[0], differencePct: 2, isMismatch: false }] });
    const wrapper = await mountSection();
    expect(wrapper.find('[data-test="mismatch-flag"]').exists()).toBe(false);
    expect(wrapper.find('.meas__row--mismatch').exists()).toBe(false);
    wrapper.unmount();
  });

  it('when a maker types a frequency and records it, then the API receives exactly the span and the frequency', async () => {
    // Arrange
    const posted: unknown[] = [];
    const saved = measurement({ id: 90, frequencyHz: 97.5, tensionN: 45.63, deviationPct: -4.94 });
    serve(summary(), (body) => {
      posted.push(body);
      return json(201, detail(saved));
    });
    const wrapper = await mountSection();
    // Act
    await typeFrequency(wrapper, '97.5');
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    await flushPromises();
    // Assert: the reference span of the first belt is chosen by default
    expect(posted).toEqual([{ spanId: 'a-back', frequencyHz: 97.5 }]);
    expect(wrapper.get('[data-test="result-frequency"]').text()).toContain('97.5 Hz');
    expect(wrapper.find('[data-test="measurement-error"]').exists()).toBe(false);
    // the list is asked again so the summary follows
    expect(
      fetchMock.mock.calls.filter(([url, init]) => url === '/api/sheets/5/measurements' && (init?.method ?? 'GET') === 'GET'),
    ).toHaveLength(2);
    wrapper.unmount();
  });

  it('when "Record" is pressed on another span, then the typed frequency is sent for that span', async () => {
    const posted: unknown[] = [];
    serve(summary(), (body) => {
      posted.push(body);
      return json(201, detail(measurement({ id: 91, spanId: 'b-back' })));
    });
    const wrapper = await mountSection();
    await wrapper.get('[data-test="record-b-back"]').trigger('click');
    await typeFrequency(wrapper, '101');
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    await flushPromises();
    expect(posted).toEqual([{ spanId: 'b-back', frequencyHz: 101 }]);
    wrapper.unmount();
  });

  it('when the API answers 422, then its message is shown to the maker beside the form', async () => {
    // Arrange
    serve(summary(), () =>
      json(422, {
        error: {
          code: 'measurement_out_of_range',
          message: 'The frequency 4000 Hz is far from the target of 100 Hz: pluck the span again.',
        },
      }),
    );
    const wrapper = await mountSection();
    // Act
    await typeFrequency(wrapper, '4000');
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    await flushPromises();
    // Assert
    expect(wrapper.get('[data-test="measurement-error"]').text()).toContain(
      'The frequency 4000 Hz is far from the target of 100 Hz: pluck the span again.',
    );
    // the typed value stays for correcting it
    expect(wrapper.get<HTMLInputElement>('[data-test="measurement-frequency"] input').element.value).toBe('4000.0');
    wrapper.unmount();
  });

  it('when no frequency is typed, then the record button stays disabled and nothing is sent', async () => {
    serve(summary(), () => json(201, {}));
    const wrapper = await mountSection();
    expect(wrapper.get('[data-test="measurement-submit"]').attributes('disabled')).toBeDefined();
    await wrapper.get('[data-test="measurement-form"]').trigger('submit');
    await flushPromises();
    expect(fetchMock.mock.calls.some(([, init]) => init?.method === 'POST')).toBe(false);
    wrapper.unmount();
  });

  it('when the user may not record, then the form and record buttons are replaced by a read-only note', async () => {
    serve(summary({ canRecord: false }));
    const wrapper = await mountSection();
    expect(wrapper.find('[data-test="measurement-form"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="record-a-back"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="measurement-read-only"]').exists()).toBe(true);
    wrapper.unmount();
  });

  it('when the list cannot be loaded, then the error is shown', async () => {
    fetchMock.mockResolvedValue(json(503, { error: { code: 'db_unavailable', message: 'The database is not answering.' } }));
    const wrapper = await mountSection();
    expect(wrapper.text()).toContain('The database is not answering.');
    expect(wrapper.find('[data-test="measurements-table"]').exists()).toBe(false);
    wrapper.unmount();
  });
});
