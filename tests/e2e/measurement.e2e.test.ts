import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';
import { synthWav, typicalPluck } from '../unit/server/uploads/synthRecording';

// Demo data seeded into gw_test_e2e by tests/helpers/e2eGlobalSetup.ts: the "Bench dispensing stage" (CoreXY) has a
// current approved sheet, and maker@example.test records measurements on it.

type SpanSummary = {
  spanId: string;
  label: string;
  beltId: string;
  fixedLength: boolean;
  lengthMm: number;
  targetFrequencyHz: number;
  targetTensionN: number;
  count: number;
  latest: { tensionN: number; frequencyHz: number } | null;
};

/** "35.12 N" → 35.12 (the page shows metric units by default). */
const newtons = (text: string | null): number =>
  Number(
    (text ?? '')
      .replace(/[^0-9.,−-]/g, '')
      .replace(',', '')
      .replace('−', '-'),
  );

async function currentBenchSheet(page: Page): Promise<number> {
  const res = await page.request.get('/api/sheets?current=true&pageSize=100');
  expect(res.ok()).toBe(true);
  const body = (await res.json()) as { items: Array<{ id: number; design: { name: string } }> };
  const sheet = body.items.find((s) => s.design.name === 'Bench dispensing stage');
  if (!sheet) throw new Error('the demo seed has no current sheet of the Bench dispensing stage');
  return sheet.id;
}

async function spansOf(page: Page, sheetId: number): Promise<SpanSummary[]> {
  const res = await page.request.get(`/api/sheets/${sheetId}/measurements`);
  expect(res.ok()).toBe(true);
  return ((await res.json()) as { spans: SpanSummary[] }).spans;
}

describe('belt tension measurement journey', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when a maker uploads a WAV of a plucked span, then the measured tension shows beside the target; a silent WAV gets the maker-friendly 422 message', async () => {
    // Arrange: the maker signs in and opens the current sheet; pick a span nobody measured yet.
    const { context, page, pageErrors } = await openPage(browser(), { baseURL, height: 1000 });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'maker@example.test');
    const sheetId = await currentBenchSheet(page);
    const span = (await spansOf(page, sheetId)).find((s) => s.beltId === 'B' && !s.fixedLength && !s.latest)!;
    expect(span).toBeTruthy();
    const f0 = Number((span.targetFrequencyHz * 1.03).toFixed(2));
    const wav = synthWav({ sampleRateHz: 16000, durationS: 2, pluck: typicalPluck(f0), hum: [[50, 0.01]], noiseRms: 0.004, seed: 21 });

    await page.goto(`/sheets/${sheetId}`);
    const row = page.locator(`[data-test="measurement-row"][data-span="${span.spanId}"]`);
    await row.waitFor();
    expect((await row.locator('[data-test="measured-tension"]').textContent())?.trim()).toBe('—');

    // Act: choose the span from its row, switch to a recording, pick the file and send it.
    await page.click(`[data-test="record-${span.spanId}"]`);
    await page.click('[data-test="measurement-mode-recording"]');
    await page.setInputFiles('[data-test="measurement-file"] input[type="file"]', {
      name: 'pluck-b.wav',
      mimeType: 'audio/wav',
      buffer: wav,
    });
    await page.click('[data-test="measurement-submit"]');

    // Assert: the result panel and the span's row show the measured tension beside the target.
    const result = page.locator('[data-test="measurement-result"]');
    await result.waitFor();
    await page.waitForFunction((id) => {
      const cell = document.querySelector(`[data-test="measurement-row"][data-span="${id}"] [data-test="measured-tension"]`);
      return !!cell && cell.textContent?.trim() !== '—';
    }, span.spanId);
    const latest = (await spansOf(page, sheetId)).find((s) => s.spanId === span.spanId)!.latest!;
    expect(Math.abs(latest.frequencyHz - f0)).toBeLessThan(0.5);
    // String law T = 4·μ·L²·f² (Halliday, Resnick & Walker, ch. 16): at a fixed span T scales with f².
    expect(latest.tensionN).toBeCloseTo(span.targetTensionN * (latest.frequencyHz / span.targetFrequencyHz) ** 2, 6);
    const shownMeasured = newtons(await row.locator('[data-test="measured-tension"]').textContent());
    const shownTarget = newtons(await row.locator('[data-test="target-tension"]').textContent());
    expect(shownMeasured).toBeCloseTo(latest.tensionN, 1);
    expect(shownTarget).toBeCloseTo(span.targetTensionN, 1);
    expect(await row.getAttribute('data-status')).toBe('ok');
    expect(await result.locator('[data-test="result-confidence"]').textContent()).toMatch(/%/);
    expect((await result.locator('h3').textContent())?.trim()).toBe(span.label);
    const plot = result.locator('[data-test="spectrum-plot"][data-drawn="yes"]');
    await plot.waitFor({ timeout: 30_000 });
    expect(JSON.parse((await plot.getAttribute('data-series')) ?? '{}').frequencyHz).toBeCloseTo(latest.frequencyHz, 6);

    // A silent recording is refused with the server's message, and nothing new is listed.
    const before = (await spansOf(page, sheetId)).find((s) => s.spanId === span.spanId)!;
    await page.setInputFiles('[data-test="measurement-file"] input[type="file"]', {
      name: 'quiet.wav',
      mimeType: 'audio/wav',
      buffer: synthWav({ sampleRateHz: 16000, durationS: 1.5 }),
    });
    await page.click('[data-test="measurement-submit"]');
    const error = page.locator('[data-test="measurement-error"]');
    await error.waitFor();
    expect(await error.textContent()).toMatch(/silent/i);
    const after = (await spansOf(page, sheetId)).find((s) => s.spanId === span.spanId)!;
    expect(after.count).toBe(before.count);

    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
