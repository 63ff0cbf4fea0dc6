import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, openPage, signInThroughForm, type OpenPage } from '../helpers/browser';

/** Confirms the open Element Plus message box (the app's confirmAction). */
async function confirmBox(page: Page): Promise<void> {
  await page.click('.el-message-box__btns .el-button--primary');
}

/** Opens the review of the newest revision of `designName` from the review desk. */
async function openFromDesk(page: Page, designName: string, revision: number): Promise<void> {
  await page.goto('/review');
  const row = page.locator('[data-test="review-desk-row"]', { hasText: designName });
  await row.waitFor();
  await row.click();
  await page.waitForSelector('[data-test="review-page"]');
  expect(await page.textContent('[data-test="review-revision-number"]')).toBe(`Revision ${revision}`);
}

describe('review journey: submit, return, fix, resubmit, approve, download', () => {
  const baseURL = inject('baseUrl');
  let browser: Browser;
  const pages: OpenPage[] = [];

  beforeAll(async () => {
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('when a designer submits, a reviewer returns it with a reason, the designer fixes and resubmits and the reviewer approves, then a maker downloads a PDF whose SHA-256 is the one shown', async () => {
    const name = `Review journey stage ${Date.now().toString(36)}`;
    const reason = 'Raise the belt pretension to 45 N so the slack side stays taut at full acceleration.';

    // Arrange: the designer's draft (made through the API of their own session; the journey starts at the Design desk).
    const designer = await openPage(browser, { baseURL });
    const reviewer = await openPage(browser, { baseURL });
    const maker = await openPage(browser, { baseURL });
    pages.push(designer, reviewer, maker);
    await designer.page.goto('/sign-in');
    await signInThroughForm(designer.page, 'designer@example.test');
    const created = await designer.page.request.post('/api/designs', { data: { template: 'corexy', name } });
    expect(created.status()).toBe(201);
    const designId = ((await created.json()) as { id: number }).id;

    // Act 1: the designer submits from the Design desk.
    await designer.page.goto(`/designs/${designId}`);
    await designer.page.click('[data-test="design-submit"]');
    await confirmBox(designer.page);
    await designer.page.waitForSelector('[data-test="design-desk"] [data-test="status-in_review"]');

    // Act 2: the reviewer finds it on the desk, reads it, comments and returns it with a reason.
    await reviewer.page.goto('/sign-in');
    await signInThroughForm(reviewer.page, 'reviewer@example.test');
    await openFromDesk(reviewer.page, name, 1);
    await reviewer.page.waitForSelector('[data-test="review-tabs"]');
    await reviewer.page.click('[data-test="review-tab-checks"]');
    await reviewer.page.waitForSelector('[data-test="checks-table"]');
    await reviewer.page.click('[data-test="review-tab-changes"]');
    await reviewer.page.waitForSelector('[data-test="diff-first"]');
    await reviewer.page.fill('[data-test="comment-input"]', 'The slack side looks close to zero at the planned acceleration.');
    await reviewer.page.click('[data-test="comment-submit"]');
    await reviewer.page.waitForSelector('[data-test="comment-body"]:has-text("slack side looks close")');
    await reviewer.page.click('[data-test="review-return"]');
    await reviewer.page.click('[data-test="return-confirm"]'); // without a reason: refused in the form
    await reviewer.page.waitForSelector('.el-form-item__error:has-text("a reason is required")');
    await reviewer.page.fill('[data-test="return-reason"]', reason);
    await reviewer.page.click('[data-test="return-confirm"]');
    expect(await reviewer.page.textContent('[data-test="review-return-reason"]')).toBe(reason);

    // Act 3: the designer sees the reason on the Design desk, fixes the pretension and submits again.
    await designer.page.reload();
    await designer.page.waitForSelector('[data-test="design-desk"] [data-test="status-returned"]');
    expect(await designer.page.textContent('[data-test="return-reason-text"]')).toBe(reason);
    const saved = designer.page.waitForResponse(
      (r) => r.url().endsWith(`/api/designs/${designId}`) && r.request().method() === 'PATCH' && r.ok(),
    );
    await designer.page.fill('[data-test="input-pretensionN"]', '45');
    await saved;
    await designer.page.click('[data-test="design-submit"]');
    await confirmBox(designer.page);
    await designer.page.waitForSelector('[data-test="design-desk"] [data-test="status-in_review"]');

    // Act 4: the reviewer opens revision 2, sees the change, and approves it with a comment.
    await openFromDesk(reviewer.page, name, 2);
    await reviewer.page.click('[data-test="review-tab-changes"]');
    await reviewer.page.waitForSelector('[data-test="diff-input-pretensionN"]');
    expect(await reviewer.page.textContent('[data-test="diff-input-pretensionN"]')).toContain('45');
    await reviewer.page.click('[data-test="review-approve"]');
    await reviewer.page.fill('[data-test="approve-comment"]', 'Pretension fixed; fine to build.');
    await reviewer.page.click('[data-test="approve-confirm"]');
    await reviewer.page.waitForSelector('[data-test="review-sheet-link"]', { timeout: 90_000 });

    // Act 5: the maker finds the sheet and downloads the PDF.
    await maker.page.goto('/sign-in');
    await signInThroughForm(maker.page, 'maker@example.test');
    await maker.page.goto('/sheets');
    const row = maker.page.locator('.el-table__row', { hasText: name });
    await row.waitFor();
    const shownInList = await row.locator('[data-test="sheet-sha256"]').getAttribute('data-sha256');
    const download = maker.page.waitForEvent('download');
    await row.locator('[data-test="sheet-download"]').click();
    const file = await (await download).path();
    const bytes = await readFile(file);

    // Assert: a real PDF, byte for byte the one whose SHA-256 the app shows (list and sheet page).
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(bytes.subarray(-8).toString('latin1')).toContain('%%EOF');
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    expect(sha256).toBe(shownInList);
    await row.locator('[data-test="sheet-row"]').click();
    await maker.page.waitForSelector('[data-test="sheet-page"]');
    expect(await maker.page.textContent('[data-test="sheet-file-a4"] [data-test="sheet-sha256"]')).toBe(sha256);
    expect(await maker.page.textContent('[data-test="sheet-comment"]')).toBe('Pretension fixed; fine to build.');
    expect((await download).suggestedFilename()).toMatch(/^review-journey-stage-[a-z0-9]+-rev2\.pdf$/);

    for (const p of pages) expect(p.pageErrors).toEqual([]);
  });
});
