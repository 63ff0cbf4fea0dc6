import { describe, expect, inject, it } from 'vitest';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

describe('Compare and Sweep journeys', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when a designer compares mechanisms and sweeps the drive pulley down to 8 teeth, then all three mechanisms are side by side and the pulleys below the belt’s minimum are marked, not plotted as good', async () => {
    // Arrange: a CoreXY draft (its belt's smallest pulley is 12 teeth).
    const { context, page, pageErrors } = await openPage(browser(), { baseURL, width: 1440, height: 1000 });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    const created = await page.request.post('/api/designs', {
      data: { template: 'corexy', name: `Sweep stage ${Date.now().toString(36)}` },
    });
    const designId = ((await created.json()) as { id: number }).id;

    // Act 1: Compare
    await page.goto(`/designs/${designId}?tab=compare`);
    const table = page.locator('[data-test="compare-table"]');
    await table.waitFor();
    await page.waitForFunction(() => document.querySelector('[data-test="compare-table"]')?.getAttribute('aria-busy') !== 'true');

    // Assert 1: one column per mechanism, yours marked.
    const headers = await table.locator('thead th').allTextContents();
    expect(headers.map((h) => h.replace('yours', '').trim())).toEqual(['Figure', 'CoreXY', 'H-bot', 'Cartesian']);
    expect(await table.locator('thead th', { hasText: 'yours' }).textContent()).toContain('CoreXY');

    // Act 2: Sweep the drive pulley from 8 to 24 teeth.
    await page.click('[data-test="tab-sweep-label"]');
    await page.waitForSelector('[data-test="tab-sweep"]');
    await page.fill('input[data-test="sweep-from"]', '8');
    await page.fill('input[data-test="sweep-to"]', '24');
    await page.click('[data-test="sweep-run"]');
    const progress = page.locator('[data-test="sweep-progress"]');
    await page.waitForFunction(
      () => {
        const el = document.querySelector('[data-test="sweep-progress"]');
        return !!el && el.getAttribute('data-done') === el.getAttribute('data-total') && Number(el.getAttribute('data-total')) > 0;
      },
      undefined,
      { timeout: 60_000 },
    );

    // Assert 2: 8 to 11 teeth fail the minimum-pulley check and are marked as such.
    expect(Number(await progress.getAttribute('data-total'))).toBe(17);
    const failing = page.locator('[data-test="sweep-failing"]');
    await failing.waitFor();
    expect(Number(await failing.getAttribute('data-count'))).toBeGreaterThanOrEqual(4);
    expect(await failing.textContent()).toMatch(/8\s+teeth/);
    const plot = page.locator('[data-test="sweep-plot-resolutionMm"][data-drawn="yes"]');
    await plot.waitFor({ timeout: 30_000 });

    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
