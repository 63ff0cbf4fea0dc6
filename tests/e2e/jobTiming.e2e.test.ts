import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

/**
 * The job journey on the Design desk, in headless chromium against the built app and a demo-seeded database
 * (tests/helpers/e2eGlobalSetup.ts): a designer uploads a job CSV, the points and the moves follow, the design is
 * saved with them (one new version), a refused file names its line, and the Error budget and Modes tabs draw their
 * maps from the result parts they ask the engine worker for.
 */

/** Waits until the engine has caught up with the inputs (the result note says "Live"). */
async function waitForLiveResults(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const note = document.querySelector('[data-test="result-note"]');
    return note?.getAttribute('data-computing') === 'no' && note.textContent?.trim().startsWith('Live');
  });
}

async function openTab(page: Page, name: string): Promise<void> {
  await page.click(`[data-test="tab-${name}-label"]`);
  await page.waitForSelector(`[data-test="tab-${name}"]`);
}

/** The heat map a plot draws (Plotly keeps its traces on the plot's div as `.data`). */
async function heatMap(page: Page, testId: string): Promise<number[][]> {
  await page.waitForSelector(`[data-test="${testId}"][data-drawn="yes"]`);
  return page.$eval(`[data-test="${testId}"] .js-plotly-plot`, (el) => {
    const data = (el as unknown as { data: Array<{ type?: string; z?: number[][] }> }).data ?? [];
    return data.find((t) => t.type === 'heatmap')?.z ?? [];
  });
}

const GOOD_CSV = 'x [mm],y [mm],dwell [ms]\n10,10,200\n150,10,0\n150,120,300\n10,120,0\n';
const BAD_CSV = 'x,y\n10,10\n20,abc\n';

describe('Job timing journey', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when a designer uploads a job file, then its points are timed, saved with the design, and a bad file names its line', async () => {
    // Arrange: a new CoreXY design
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    await page.goto('/designs');
    await page.click('[data-test="new-design"]');
    await page.click('[data-test="new-template-corexy"]');
    await page.fill('[data-test="new-design-name"]', `Job stage ${Date.now()}`);
    await page.click('[data-test="new-design-create"]');
    await page.waitForURL(/\/designs\/\d+/);
    const designUrl = new URL(page.url()).pathname;
    await page.waitForSelector('[data-test="desk-inputs"]');
    await waitForLiveResults(page);
    await openTab(page, 'job');
    await page.waitForSelector('[data-test="job-empty"]');
    const versionBefore = Number(await page.textContent('[data-test="design-version"]'));

    // Act: upload four points with units in the header
    await page.setInputFiles('[data-test="job-file"]', { name: 'square.csv', mimeType: 'text/csv', buffer: Buffer.from(GOOD_CSV) });

    // Assert: four points, three moves, a cycle time, and a new version stored with the points in mm and s
    await page.waitForSelector('[data-test="job-points"]');
    await waitForLiveResults(page);
    expect(await page.locator('[data-test="job-points"] tbody tr').count()).toBe(4);
    expect(await page.locator('[data-test="job-moves"] tbody tr').count()).toBe(3);
    expect(await page.textContent('[data-test="job-total"]')).toMatch(/\d+(\.\d+)?\s*s/);
    expect(Number(await page.textContent('[data-test="design-version"]'))).toBe(versionBefore + 1);
    const stored = await page.evaluate(async (path) => {
      const res = await fetch(`/api${path}`);
      return ((await res.json()) as { inputs: { job: { points: unknown[] } | null } }).inputs.job;
    }, designUrl);
    expect(stored?.points).toEqual([
      { xMm: 10, yMm: 10, dwellS: 0.2 },
      { xMm: 150, yMm: 10, dwellS: 0 },
      { xMm: 150, yMm: 120, dwellS: 0.3 },
      { xMm: 10, yMm: 120, dwellS: 0 },
    ]);

    // Act: a file with a word where a number belongs
    await page.setInputFiles('[data-test="job-file"]', { name: 'bad.csv', mimeType: 'text/csv', buffer: Buffer.from(BAD_CSV) });

    // Assert: the problem names line 3 and column y; the points stay
    await page.waitForSelector('[data-test="job-upload-problems"]');
    expect(await page.textContent('[data-test="job-upload-problems"]')).toMatch(/line 3.*y/s);
    expect(await page.locator('[data-test="job-points"] tbody tr').count()).toBe(4);

    // Assert: the error and mode maps arrive with their tabs (packed parts) and cover the map grid
    await openTab(page, 'errors');
    const errors = await heatMap(page, 'error-map');
    expect(errors.length).toBeGreaterThan(5);
    expect(errors.flat().every((v) => Number.isFinite(v) && v > 0)).toBe(true);
    await openTab(page, 'modes');
    const modes = await heatMap(page, 'lowest-mode-map');
    expect(modes.length).toBe(errors.length);
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
