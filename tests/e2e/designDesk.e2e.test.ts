import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

/**
 * The designing journey on the Design desk, in headless chromium against the built app and a demo-seeded
 * database (tests/helpers/e2eGlobalSetup.ts). Assertions read the numbers the plots actually draw (Plotly keeps
 * its traces on the plot's div as `.data`), not just that a plot is there.
 */

/** The traces a plot draws: Plotly stores them on the div it drew into. */
async function plotted(page: Page, testId: string): Promise<unknown> {
  await page.waitForSelector(`[data-test="${testId}"][data-drawn="yes"]`);
  return page.$eval(`[data-test="${testId}"] .js-plotly-plot`, (el) =>
    ((el as unknown as { data: Array<Record<string, unknown>> }).data ?? []).map((t) => ({ name: t.name, r: t.r, x: t.x, y: t.y, z: t.z })),
  );
}

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

async function typeInto(page: Page, path: string, value: string): Promise<void> {
  const input = page.locator(`input[data-test="input-${path}"]`);
  await input.fill(value);
  await input.blur();
}

describe('Design desk journey', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();
  let designUrl = '';
  const name = `Crossed-belt bench stage ${Date.now()}`;

  it('when a designer builds a crossed-belt design, then the coupling and stiffness maps follow the frame and belt, imperial shows, and it is saved', async () => {
    // Arrange: sign in and start from the CoreXY template
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    await page.goto('/designs');
    await page.click('[data-test="new-design"]');
    await page.click('[data-test="new-template-corexy"]');
    await page.fill('[data-test="new-design-name"]', name);
    await page.click('[data-test="new-design-create"]');
    await page.waitForURL(/\/designs\/\d+/);
    designUrl = new URL(page.url()).pathname;
    await page.waitForSelector('[data-test="desk-inputs"]');
    await waitForLiveResults(page);
    expect(await page.inputValue('input[data-test="input-frame.outerXMm"]')).toBe('460');

    await openTab(page, 'coupling');
    const couplingBefore = await plotted(page, 'coupling-pull');
    const speedShareBefore = await plotted(page, 'coupling-speed');
    await openTab(page, 'stiffness');
    const stiffnessBefore = await plotted(page, 'stiffness-map');
    const minBefore = await page.textContent('[data-test="stiffness-min"]');

    // Act: a bigger frame and a wider belt
    await typeInto(page, 'frame.outerXMm', '600');
    await typeInto(page, 'frame.outerYMm', '560');
    await typeInto(page, 'belt.widthMm', '9');
    await typeInto(page, 'belt.axialStiffnessN', '60000');
    await waitForLiveResults(page);

    // Assert: the stiffness map now covers the larger travel, with other frequencies
    await page.waitForFunction(
      (before) => {
        const el = document.querySelector('[data-test="stiffness-map"] .js-plotly-plot') as unknown as {
          data?: Array<{ x: number[]; z: number[][] }>;
        } | null;
        return !!el?.data && JSON.stringify(el.data[0].z) !== before;
      },
      JSON.stringify((stiffnessBefore as Array<{ z: unknown }>)[0].z),
    );
    const stiffnessAfter = (await plotted(page, 'stiffness-map')) as Array<{ x: number[]; z: number[][] }>;
    const xBefore = (stiffnessBefore as Array<{ x: number[] }>)[0].x;
    expect(Math.max(...stiffnessAfter[0].x)).toBeGreaterThan(Math.max(...xBefore) + 100);
    expect(await page.textContent('[data-test="stiffness-min"]')).not.toBe(minBefore);

    // Assert: the coupling map's belt pulls changed (longer, heavier belts), while the kinematic speed shares did not
    await openTab(page, 'coupling');
    const couplingAfter = await plotted(page, 'coupling-pull');
    expect(JSON.stringify(couplingAfter)).not.toBe(JSON.stringify(couplingBefore));
    expect(JSON.stringify(await plotted(page, 'coupling-speed'))).toBe(JSON.stringify(speedShareBefore));

    // Assert: autosave stored the change
    await page.waitForSelector('[data-test="save-status"][data-status="saved"]');

    // Act: imperial
    await page.click('[data-test="units-imperial"]');
    // Assert: 600 mm reads 23.62 in (600 / 25.4 = 23.622, NIST SP 811 B.8 inch, shown to within 0.01 %); the stored
    // value stays in mm. fix: #13 imperial inputs no longer show conversion noise
    expect(await page.inputValue('input[data-test="input-frame.outerXMm"]')).toBe('23.62');
    await openTab(page, 'stiffness');
    const imperialMap = (await plotted(page, 'stiffness-map')) as Array<{ x: number[] }>;
    expect(Math.max(...imperialMap[0].x)).toBeCloseTo(Math.max(...stiffnessAfter[0].x) / 25.4, 6);

    // Act: reload
    await page.reload();
    await page.waitForSelector('[data-test="desk-inputs"]');
    // Assert: the design was saved, and the unit choice kept
    expect(await page.inputValue('input[data-test="input-frame.outerXMm"]')).toBe('23.62');
    expect(await page.inputValue('input[data-test="input-belt.widthMm"]')).toBe('0.3543');
    const stored = await page.evaluate(async (path) => {
      const res = await fetch(`/api${path}`);
      return (await res.json()) as { inputs: { frame: { outerXMm: number; outerYMm: number }; belt: { widthMm: number } }; name: string };
    }, designUrl);
    expect(stored.name).toBe(name);
    expect(stored.inputs.frame).toMatchObject({ outerXMm: 600, outerYMm: 560 });
    expect(stored.inputs.belt.widthMm).toBe(9);
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('when a reviewer opens that design, then everything is read-only and the server refuses a change', async () => {
    // Arrange
    expect(designUrl).toMatch(/^\/designs\/\d+$/);
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'reviewer@example.test');
    // Act
    await page.goto(designUrl);
    await page.waitForSelector('[data-test="desk-inputs"]');
    // Assert
    await page.waitForSelector('[data-test="read-only-banner"]');
    // The server's reason (a reviewer is not a designer), in the formatting layer's words.
    expect(await page.textContent('[data-test="read-only-banner"]')).toContain('only designers and admins change designs');
    expect(await page.isDisabled('input[data-test="input-frame.outerXMm"]')).toBe(true);
    expect(await page.isDisabled('input[data-test="input-belt.widthMm"]')).toBe(true);
    expect(await page.isDisabled('input[data-test="design-name"]')).toBe(true);
    expect(await page.getAttribute('[data-test="save-status"]', 'data-status')).toBe('readonly');
    await waitForLiveResults(page);
    await openTab(page, 'checks');
    expect(await page.locator('[data-test="checks-table"] tbody tr').count()).toBeGreaterThan(5);
    const refused = await page.evaluate(async (path) => {
      const res = await fetch(`/api${path}`, {
        method: 'PATCH',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ name: 'Changed by a reviewer', version: 1 }),
      });
      return res.status;
    }, designUrl);
    expect(refused).toBe(403);
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
