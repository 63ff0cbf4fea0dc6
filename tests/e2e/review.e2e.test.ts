import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { defaultDesign } from '@/engine';
import { fakeMicrophoneArgs, useBrowser, openPage, signInThroughForm, type OpenPage } from '../helpers/browser';
import { synthWav, typicalPluck } from '../unit/server/uploads/synthRecording';

/** What the fake microphone hears: a belt plucked at this frequency, again and again (chromium loops the file). */
const MIC_PLUCK_HZ = 150;

/** Submits from the Design desk: the dialog lists the checks; confirms it. */
async function submitFromDesk(page: Page): Promise<void> {
  await page.click('[data-test="design-submit"]');
  await page.waitForSelector('[data-test="submit-dialog"] [data-test="submit-counts"]');
  await page.click('[data-test="submit-confirm"]');
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
  let micDir = '';
  let wavPath = '';
  const pages: OpenPage[] = [];

  beforeAll(() => {
    // The maker's phone records "from the microphone": chromium plays this WAV as its input.
    micDir = mkdtempSync(path.join(tmpdir(), 'gw-mic-'));
    wavPath = path.join(micDir, 'pluck.wav');
    writeFileSync(
      wavPath,
      synthWav({ sampleRateHz: 48000, durationS: 1.5, pluck: typicalPluck(MIC_PLUCK_HZ, { onsetS: 0.05 }), noiseRms: 0.002, seed: 5 }),
    );
  });
  // After the hook above: chromium starts once the WAV it plays is written.
  const browser = useBrowser(() => fakeMicrophoneArgs(wavPath));

  afterAll(() => {
    if (micDir) rmSync(micDir, { recursive: true, force: true });
  });

  it('when a designer submits, a reviewer returns it with a reason, the designer fixes and resubmits and the reviewer approves, then a maker downloads a PDF whose SHA-256 is the one shown and records a typed and a recorded pluck on a phone', async () => {
    const name = `Review journey stage ${Date.now().toString(36)}`;
    const reason = 'Raise the belt pretension to 45 N so the slack side stays taut at full acceleration.';

    // Arrange: the designer's draft (made through the API of their own session; the journey starts at the Design desk).
    const designer = await openPage(browser(), { baseURL });
    const reviewer = await openPage(browser(), { baseURL });
    const maker = await openPage(browser(), { baseURL });
    pages.push(designer, reviewer, maker);
    await designer.page.goto('/sign-in');
    await signInThroughForm(designer.page, 'designer@example.test');
    // The CoreXY template run at 80 % of its torque: a torque-margin warning, and at 40 N pretension both belts' slack
    // sides fall low enough to warn about ratcheting. A fast controller and a stout motor shaft keep the second layer's
    // step-rate and shaft-load checks out of this journey (they have their own tests).
    const secondLayer = { controller: { maxStepRateHz: 400000, jerkMmPerS3: null }, radialLoadRating: { motorShaftN: 150, idlerN: 200 } };
    const created = await designer.page.request.post('/api/designs', {
      data: { ...defaultDesign('corexy'), ...secondLayer, name, torqueMargin: 0.8 },
    });
    expect(created.status()).toBe(201);
    const designId = ((await created.json()) as { id: number }).id;

    // Act 1: the designer submits from the Design desk.
    await designer.page.goto(`/designs/${designId}`);
    await designer.page.waitForSelector('[data-test="tab-summary"]');
    await designer.page.click('[data-test="design-submit"]');
    // The submit dialog lists the design's warnings (torque margin, both belts' slack side) before anything is frozen.
    await designer.page.waitForSelector('[data-test="submit-dialog"] [data-test="submit-counts"]');
    expect(await designer.page.locator('[data-test="submit-check"][data-severity="warn"]').count()).toBe(3);
    await designer.page.click('[data-test="submit-confirm"]');
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
    await submitFromDesk(designer.page);
    await designer.page.waitForSelector('[data-test="design-desk"] [data-test="status-in_review"]');

    // Act 4: the reviewer opens revision 2, sees the change, and approves it with a comment.
    await openFromDesk(reviewer.page, name, 2);
    await reviewer.page.click('[data-test="review-tab-changes"]');
    await reviewer.page.waitForSelector('[data-test="diff-input-pretensionN"]');
    expect(await reviewer.page.textContent('[data-test="diff-input-pretensionN"]')).toContain('45');
    await reviewer.page.click('[data-test="review-approve"]');
    // The approve dialog shows what the reviewer approves over: no failure, the torque-margin warning, so no justification asked.
    await reviewer.page.waitForSelector('[data-test="approve-counts"] [data-test="count-warn"][data-count="1"]');
    expect(await reviewer.page.isVisible('[data-test="approve-justification"]')).toBe(false);
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

    // Act 6: at the machine, the maker opens the sheet on a phone and records a typed pluck on the reference span.
    const sheetPath = new URL(maker.page.url()).pathname;
    const phone = await openPage(browser(), { baseURL, width: 390, height: 844 });
    pages.push(phone);
    await phone.page.goto('/sign-in');
    await signInThroughForm(phone.page, 'maker@example.test');
    await phone.page.goto(sheetPath);
    const reference = phone.page.locator('[data-test="measurement-row"]', { has: phone.page.locator('.meas__tag') }).first();
    await reference.waitFor();
    const spanId = (await reference.getAttribute('data-span'))!;
    const target = Number((await reference.locator('[data-test="target-frequency"]').textContent())!.match(/[\d.]+/)![0]);
    await reference.locator(`[data-test="record-${spanId}"]`).click();
    // Twice the target: the second harmonic rang loudest.
    await phone.page.fill('[data-test="measurement-frequency"] input', (2 * target).toFixed(1));
    await phone.page.click('[data-test="measurement-submit"]');

    // Assert 6: recorded, and the maker is told it may be the second harmonic.
    const hint = phone.page.locator('[data-test="measurement-result"] [data-test="pluck-hint"]');
    await hint.waitFor();
    expect(await hint.getAttribute('data-harmonic')).toBe('2');
    expect(await phone.page.getAttribute(`[data-test="measurement-row"][data-span="${spanId}"]`, 'data-status')).toBe('high');

    // Act 7: the same span, recorded with the phone's microphone (countdown, level meter, 3 s of sound).
    await phone.page.click('[data-test="measurement-mode-microphone"]');
    await phone.page.click('[data-test="recorder-start"]');
    await phone.page.waitForSelector('[data-test="pluck-recorder"][data-phase="countdown"]');
    await phone.page.waitForSelector('[data-test="pluck-recorder"][data-phase="recording"]', { timeout: 10_000 });
    await phone.page.waitForFunction(() => Number(document.querySelector('[data-test="recorder-level"]')?.getAttribute('data-level')) > 0);
    await phone.page.waitForSelector('[data-test="pluck-recorder"][data-phase="done"]', { timeout: 15_000 });
    const uploaded = phone.page.waitForResponse((r) => r.url().includes('/measurements') && r.request().method() === 'POST');
    await phone.page.click('[data-test="measurement-submit"]');
    const answer = (await (await uploaded).json()) as { source: string; frequencyHz: number; recording: { size: number } | null };

    // Assert 7: the WAV made in the browser reached the same analysis as an uploaded file, and found the pluck.
    expect(answer.source).toBe('recording');
    expect(Math.abs(answer.frequencyHz - MIC_PLUCK_HZ)).toBeLessThan(2);
    expect(answer.recording?.size ?? 0).toBeGreaterThan(44);
    await phone.page.waitForSelector('[data-test="measurement-result"] [data-test="result-confidence"]');
    expect(await phone.page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBe(0);

    for (const p of pages) expect(p.pageErrors).toEqual([]);
  });
});
