import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowser, navKeys, openPage, signInThroughForm } from '../helpers/browser';

/** Clicks Refresh in the Outbox until a mail to `address` is listed (mail is delivered in the background). */
async function waitForMailTo(page: Page, address: string): Promise<void> {
  for (let attempt = 0; attempt < 40; attempt += 1) {
    const found = await page.$(`[data-test="outbox-item"]:has-text("${address}")`);
    if (found) {
      await found.click();
      return;
    }
    await page.waitForTimeout(250);
    await page.click('[data-test="outbox-refresh"]');
    await page.waitForLoadState('networkidle');
  }
  throw new Error(`No e-mail to ${address} reached the Outbox.`);
}

describe('invitation journey', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it('when an admin invites someone, then the e-mailed link lets them set a password and sign in with the chosen roles', async () => {
    // Arrange: a unique address so reruns against the same database do not collide.
    const email = `new.maker.${Date.now().toString(36)}@example.test`;
    const admin = await openPage(browser(), { baseURL });
    await admin.page.goto('/sign-in');
    await signInThroughForm(admin.page, 'admin@example.test');

    // Act 1: invite through the Team screen.
    await admin.page.goto('/team');
    await admin.page.click('[data-test="team-invite"]');
    await admin.page.fill('[data-test="invite-name"]', 'Nia Newcomer');
    await admin.page.fill('[data-test="invite-email"]', email);
    await admin.page.click('[data-test="role-designer"]'); // untick the default
    await admin.page.click('[data-test="role-maker"]');
    await admin.page.click('[data-test="invite-submit"]');
    await admin.page.waitForSelector(`[data-test="team-row"][data-email="${email}"]`);

    // Act 2: read the invitation in the Outbox and take its set-password link.
    await admin.page.click('[data-test="nav-outbox"]');
    await waitForMailTo(admin.page, email);
    const links = await admin.page.$$eval('[data-test="outbox-link"]', (els) => els.map((el) => el.getAttribute('href') ?? ''));
    const invite = links.find((href) => href.includes('/reset?') && href.includes('invite=1'));
    expect(invite, `links in the invitation: ${links.join(', ')}`).toBeTruthy();

    // Act 3: the new person opens the link in their own browser context.
    const newcomer = await openPage(browser(), { baseURL });
    const target = new URL(invite!);
    await newcomer.page.goto(`${target.pathname}${target.search}`);
    expect(await newcomer.page.textContent('[data-test="page-title"]')).toBe('Set your password');
    await newcomer.page.fill('[data-test="reset-password"]', 'a long enough password');
    await newcomer.page.fill('[data-test="reset-confirm"]', 'a long enough password');
    await newcomer.page.click('[data-test="reset-submit"]');

    // Assert: signed in as a maker.
    await newcomer.page.waitForSelector('[data-test="nav"]');
    await newcomer.page.waitForURL((url) => url.pathname === '/sheets');
    expect(await navKeys(newcomer.page)).toEqual(['sheets', 'parts']);
    expect(await newcomer.page.textContent('[data-test="user-name"]')).toBe('Nia Newcomer');

    // The link works once.
    const reuse = await openPage(browser(), { baseURL });
    await reuse.page.goto(`${target.pathname}${target.search}`);
    await reuse.page.fill('[data-test="reset-password"]', 'another long password');
    await reuse.page.fill('[data-test="reset-confirm"]', 'another long password');
    await reuse.page.click('[data-test="reset-submit"]');
    await reuse.page.waitForSelector('[data-test="error-message"]');
    expect(await reuse.page.isVisible('[data-test="nav"]')).toBe(false);

    expect([...admin.pageErrors, ...newcomer.pageErrors, ...reuse.pageErrors]).toEqual([]);
    await Promise.all([admin.context.close(), newcomer.context.close(), reuse.context.close()]);
  });
});
