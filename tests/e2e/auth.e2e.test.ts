import { describe, expect, inject, it } from 'vitest';
import { useBrowser, navKeys, openPage, signInThroughForm, signOut, waitForSignInWithNext } from '../helpers/browser';

// Demo accounts seeded into gw_test_e2e by tests/helpers/e2eGlobalSetup.ts (password gantry-demo).
const ROLE_JOURNEYS: Array<[email: string, start: string, nav: string[]]> = [
  ['admin@example.test', '/designs', ['designs', 'review', 'sheets', 'parts', 'team', 'outbox']],
  ['designer@example.test', '/designs', ['designs', 'sheets', 'parts']],
  ['designer2@example.test', '/designs', ['designs', 'sheets', 'parts']],
  ['reviewer@example.test', '/review', ['designs', 'review', 'sheets', 'parts']],
  ['maker@example.test', '/sheets', ['sheets', 'parts']],
];

describe('sign-in journeys', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it.each(ROLE_JOURNEYS)(
    'when %s signs in, then lands on %s, sees exactly the navigation %j, and can sign out',
    async (email, start, nav) => {
      // Arrange
      const { context, page, pageErrors } = await openPage(browser(), { baseURL });
      await page.goto('/');
      await page.waitForURL(/\/sign-in$/);
      // Act
      await signInThroughForm(page, email);
      // Assert
      await page.waitForURL((url) => url.pathname === start);
      expect(await navKeys(page)).toEqual(nav);
      await page.click('[data-test="user-menu"]');
      await page.waitForSelector('[data-test="user-card"]');
      expect(await page.textContent('[data-test="user-card"]')).toContain(email);

      await signOut(page);
      // Signed out for real: a private screen sends us back to sign-in, remembering where we were going.
      await page.goto('/parts');
      await waitForSignInWithNext(page, '/parts');
      expect(await page.isVisible('[data-test="sign-in-submit"]')).toBe(true);
      expect(pageErrors).toEqual([]);
      await context.close();
    },
  );

  it('when the password is wrong, then shows the server message and stays on sign-in', async () => {
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/sign-in');
    await page.fill('[data-test="sign-in-email"]', 'designer@example.test');
    await page.fill('[data-test="sign-in-password"]', 'not-the-password');
    await page.click('[data-test="sign-in-submit"]');
    const error = await page.waitForSelector('[data-test="error-message"]');
    expect(await error.textContent()).toContain('Wrong e-mail or password.');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await page.inputValue('[data-test="sign-in-password"]')).toBe('');
    expect(await page.isVisible('[data-test="nav"]')).toBe(false);
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('when a maker opens the Team screen, then sees Not allowed and no Team navigation', async () => {
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/team');
    await waitForSignInWithNext(page, '/team');
    await signInThroughForm(page, 'maker@example.test');
    // The sign-in page honours ?next=, so the maker arrives at /team itself.
    await page.waitForURL((url) => url.pathname === '/team');
    const refusal = await page.waitForSelector('[data-test="not-allowed"]');
    expect(await refusal.textContent()).toContain('Not allowed');
    expect(await page.title()).toBe('Not allowed · Gantrywright');
    expect(await page.isVisible('[data-test="team-table"]')).toBe(false);
    expect(await navKeys(page)).not.toContain('team');
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('when an admin follows a link to Team while signed out, then arrives at the team list after signing in', async () => {
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/team');
    await waitForSignInWithNext(page, '/team');
    await signInThroughForm(page, 'admin@example.test');
    await page.waitForURL((url) => url.pathname === '/team');
    await page.waitForSelector('[data-test="team-row"][data-email="reviewer@example.test"]');
    const emails = await page.$$eval('[data-test="team-email"]', (els) => els.map((el) => el.textContent?.trim()));
    expect(emails).toEqual(
      expect.arrayContaining([
        'admin@example.test',
        'designer@example.test',
        'designer2@example.test',
        'reviewer@example.test',
        'maker@example.test',
      ]),
    );
    expect(await page.title()).toBe('Team · Gantrywright');
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('when the theme is switched to dark, then it stays dark after a reload', async () => {
    const { context, page, pageErrors } = await openPage(browser(), { baseURL, colorScheme: 'light' });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(false);
    await page.click('[data-test="theme-toggle"]');
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true);
    await page.reload();
    await page.waitForSelector('[data-test="nav"]');
    expect(await page.evaluate(() => document.documentElement.classList.contains('dark'))).toBe(true);
    expect(pageErrors).toEqual([]);
    await context.close();
  });

  it('when someone opens Active sessions from the user menu, then the dialog shows over the page, not clipped to the header', async () => {
    // Arrange
    const { context, page, pageErrors } = await openPage(browser(), { baseURL });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    // Act
    await page.click('[data-test="user-menu"]');
    await page.click('[data-test="open-sessions"]');
    const row = page.locator('[data-test="session-row"]').first();
    await row.waitFor();
    // Assert: what is drawn at the middle of the first session row is that row (the header's backdrop blur used to
    // confine the dialog to the header's box, so the page showed there instead)
    const rowIsOnTop = await row.evaluate((el) => {
      const r = el.getBoundingClientRect();
      return el.contains(document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2));
    });
    expect(rowIsOnTop).toBe(true);
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
