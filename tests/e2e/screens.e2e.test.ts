import { describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { horizontalOverflow, seriousViolations } from '../helpers/a11y';
import { useBrowser, openPage, signInThroughForm } from '../helpers/browser';

// Every screen of the app, as people meet it: at desktop width in the light theme, and on phones of 360 px (light)
// and 430 px (dark). On each one axe-core (4.14) must find no serious or critical violation, and on a phone the page
// must not scroll sideways. The demo data seeded into gw_test_e2e fills the screens.

/** One screen: where it is and what shows once it has loaded. */
interface Screen {
  name: string;
  path: string;
  ready: string;
  /** Clicked after loading (opens a dialog or a tab) before checking. */
  click?: string;
  /** Shown once the click took effect. */
  then?: string;
  /** The tab to click when the screen at `path` is already open. */
  tab?: string;
}

type Ids = { draft: number; failedRevision: number; sheet: number };

/** Ids of demo rows the screens need, read through the API of a signed-in page. */
async function demoIds(page: Page): Promise<Ids> {
  const designs = (await (await page.request.get('/api/designs?pageSize=100')).json()) as { items: { id: number; name: string }[] };
  const revisions = (await (await page.request.get('/api/revisions?status=in_review&pageSize=100')).json()) as {
    items: { id: number; name: string }[];
  };
  const sheets = (await (await page.request.get('/api/sheets?current=true&pageSize=100')).json()) as {
    items: { id: number; design: { name: string } }[];
  };
  const draft = designs.items.find((d) => d.name === 'Sample tray picker');
  const failed = revisions.items.find((r) => r.name === 'Fast pick-and-place head');
  const sheet = sheets.items.find((s) => s.design.name === 'Bench dispensing stage');
  if (!draft || !failed || !sheet) throw new Error('the demo seed lacks the draft, the failed revision or the current sheet');
  return { draft: draft.id, failedRevision: failed.id, sheet: sheet.id };
}

const DESK_TABS = ['coupling', 'speed', 'stiffness', 'tension', 'errors', 'modes', 'drive', 'job', 'checks', 'compare', 'sweep'];

function signedInScreens(ids: Ids, isPhone: boolean, isDark: boolean): Screen[] {
  const desk = `/designs/${ids.draft}`;
  const review = `/review/${ids.failedRevision}`;
  const all: Screen[] = [
    { name: 'Designs', path: '/designs', ready: '[data-test="design-row"]' },
    {
      name: 'New design dialog',
      path: '/designs',
      ready: '[data-test="design-row"]',
      click: '[data-test="new-design"]',
      then: '[data-test="new-design-dialog"]',
    },
    { name: 'Design desk', path: desk, ready: '[data-test="tab-summary"]' },
    ...DESK_TABS.map((tab) => ({
      name: `Design desk: ${tab}`,
      path: desk,
      tab: `[data-test="tab-${tab}-label"]`,
      ready: `[data-test="tab-${tab}"]`,
    })),
    {
      name: 'Submit dialog',
      path: desk,
      ready: '[data-test="result-tabs"]',
      click: '[data-test="design-submit"]',
      then: '[data-test="submit-counts"]',
    },
    { name: 'Review desk', path: '/review', ready: '[data-test="review-desk-row"]' },
    { name: 'Review', path: review, ready: '[data-test="review-page"] [data-test="tab-summary"]' },
    { name: 'Review: changes', path: review, tab: '[data-test="review-tab-changes"]', ready: '[data-test="review-diff"]' },
    { name: 'Review: inputs', path: review, tab: '[data-test="review-tab-inputs"]', ready: '[data-test="review-inputs"]' },
    {
      name: 'Approve dialog',
      path: review,
      ready: '[data-test="review-page"]',
      click: '[data-test="review-approve"]',
      then: '[data-test="approve-checks"]',
    },
    { name: 'Sheets', path: '/sheets', ready: '[data-test="sheet-row"]' },
    { name: 'Sheet', path: `/sheets/${ids.sheet}`, ready: '[data-test="measurement-row"]' },
    {
      name: 'Sheet: record with the microphone',
      path: `/sheets/${ids.sheet}`,
      ready: '[data-test="measurement-row"]',
      click: '[data-test="measurement-mode-microphone"]',
      then: '[data-test="pluck-recorder"]',
    },
    { name: 'Parts shelf: belts', path: '/parts', ready: '[data-test="part-row"]' },
    { name: 'Parts shelf: pulleys', path: '/parts?shelf=pulleys', ready: '[data-test="part-row"]' },
    { name: 'Parts shelf: motors', path: '/parts?shelf=motors', ready: '[data-test="part-row"]' },
    {
      name: 'Torque table dialog',
      path: '/parts?shelf=motors',
      ready: '[data-test="part-row"]',
      click: '[data-test^="torque-table-open"]',
      then: '[data-test="torque-status"]',
    },
    { name: 'Team', path: '/team', ready: '[data-test="team-row"]' },
    { name: 'Outbox', path: '/outbox', ready: '[data-test="outbox-refresh"]' },
    { name: 'Your account', path: '/account', ready: '[data-test="account"]' },
    {
      name: 'Active sessions dialog',
      path: '/account',
      ready: '[data-test="account"]',
      click: '[data-test="account-sessions"]',
      then: '[data-test="session-row"]',
    },
    { name: 'Not found', path: '/no-such-screen', ready: '[data-test="not-found"]' },
  ];
  if (!isPhone) return all;
  // Phones: the screens without the per-tab and per-shelf variations (the same components, already checked at desktop
  // width); in the dark theme, the screens with the most colours (status tags, checks, cautions, dialogs).
  const onPhone = isDark
    ? ['Design desk', 'Review', 'Approve dialog', 'Sheet', 'Parts shelf: motors', 'Team']
    : [
        'Designs',
        'Design desk',
        'Design desk: errors',
        'Design desk: modes',
        'Design desk: drive',
        'Design desk: job',
        'Design desk: checks',
        'Design desk: compare',
        'Design desk: sweep',
        'Review desk',
        'Review',
        'Approve dialog',
        'Sheets',
        'Sheet',
        'Sheet: record with the microphone',
        'Parts shelf: motors',
        'Team',
        'Outbox',
        'Your account',
        'Active sessions dialog',
      ];
  return all.filter((s) => onPhone.includes(s.name));
}

const SIGNED_OUT: Screen[] = [
  { name: 'Sign in', path: '/sign-in', ready: '[data-test="sign-in-submit"]' },
  { name: 'Forgot password', path: '/forgot', ready: '[data-test="forgot-submit"]' },
  { name: 'Set a new password', path: '/reset?token=not-a-real-token', ready: '[data-test="reset-submit"]' },
];

const VIEWS = [
  { label: 'desktop, light', width: 1440, height: 900, colorScheme: 'light' as const, isPhone: false },
  { label: 'phone 360 px, light', width: 360, height: 780, colorScheme: 'light' as const, isPhone: true },
  { label: 'phone 430 px, dark', width: 430, height: 932, colorScheme: 'dark' as const, isPhone: true },
];

/** Opens a screen, then checks it: axe (serious and critical), and on phones no sideways scrolling. */
async function check(page: Page, screen: Screen, isPhone: boolean): Promise<string[]> {
  // A tab of the screen already open is reached by clicking it, as people do (and without reloading the app).
  if (screen.tab && new URL(page.url()).pathname === screen.path) await page.click(screen.tab);
  else await page.goto(screen.path);
  await page.waitForSelector(screen.ready);
  if (screen.click) {
    await page.click(screen.click);
    await page.waitForSelector(screen.then ?? screen.ready);
  }
  const problems: string[] = [];
  // Plot internals are Plotly's own drawing; each plot is a figure named by its description, checked as such.
  for (const v of await seriousViolations(page, { exclude: ['.js-plotly-plot'] }))
    problems.push(`${screen.name}: ${v.impact} ${v.id} (${v.help}) at ${v.targets.join(' | ')}`);
  if (isPhone) {
    const { overflowPx, culprits } = await horizontalOverflow(page);
    if (overflowPx > 0) problems.push(`${screen.name}: ${overflowPx} px wider than the phone (${culprits.join('; ')})`);
  }
  return problems;
}

describe('every screen, readable for everyone', () => {
  const baseURL = inject('baseUrl');
  const browser = useBrowser();

  it.each(VIEWS)(
    'when every screen is opened at $label, then axe finds no serious or critical violation and phones never scroll sideways',
    async ({ width, height, colorScheme, isPhone }) => {
      // Arrange
      const visitor = await openPage(browser(), { baseURL, width, height, colorScheme, bypassCSP: true });
      const admin = await openPage(browser(), { baseURL, width, height, colorScheme, bypassCSP: true });
      await admin.page.goto('/sign-in');
      await signInThroughForm(admin.page, 'admin@example.test');
      const ids = await demoIds(admin.page);

      // Act
      const problems: string[] = [];
      for (const screen of SIGNED_OUT) problems.push(...(await check(visitor.page, screen, isPhone)));
      for (const screen of signedInScreens(ids, isPhone, colorScheme === 'dark'))
        problems.push(...(await check(admin.page, screen, isPhone)));

      // Assert
      expect(problems).toEqual([]);
      expect([...visitor.pageErrors, ...admin.pageErrors]).toEqual([]);
      await Promise.all([visitor.context.close(), admin.context.close()]);
    },
    240_000,
  );

  it('when a keyboard user opens the Design desk, then the first Tab stop skips straight to the results', async () => {
    // Arrange
    const { context, page } = await openPage(browser(), { baseURL, width: 1440, height: 900 });
    await page.goto('/sign-in');
    await signInThroughForm(page, 'designer@example.test');
    const ids = await demoIds(page).catch(() => null);
    const designs = (await (await page.request.get('/api/designs?pageSize=100')).json()) as { items: { id: number; name: string }[] };
    const draftId = ids?.draft ?? designs.items[0].id;
    await page.goto(`/designs/${draftId}`);
    await page.waitForSelector('[data-test="tab-summary"]');

    // Act
    await page.keyboard.press('Tab');
    const first = await page.evaluate(() => document.activeElement?.getAttribute('data-test'));
    await page.keyboard.press('Enter');

    // Assert
    expect(first).toBe('skip-to-results');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('wb-results');
    await context.close();
  });

  it('when a reviewer signs in on a phone, then the Review desk opens, the menu drawer shows how many revisions wait, and a link there closes it', async () => {
    // Arrange
    const { context, page, pageErrors } = await openPage(browser(), { baseURL, width: 390, height: 844 });
    await page.goto('/sign-in');
    await page.fill('[data-test="sign-in-email"]', 'reviewer@example.test');
    await page.fill('[data-test="sign-in-password"]', 'gantry-demo');
    await page.click('[data-test="sign-in-submit"]');

    // Act
    await page.waitForURL((url) => url.pathname === '/review');
    await page.waitForSelector('[data-test="review-desk-row"]');
    await page.click('[data-test="nav-menu"]');
    const count = page.locator('[data-test="nav-drawer"] [data-test="review-waiting-count"]');
    await count.waitFor();
    const waiting = Number(await count.getAttribute('data-count'));
    const listed = await page.locator('[data-test="review-desk-row"]').count();
    await page.click('[data-test="nav-drawer"] [data-test="nav-sheets"]');

    // Assert
    expect(waiting).toBe(listed);
    await page.waitForURL((url) => url.pathname === '/sheets');
    await page.waitForSelector('[data-test="nav-drawer"]', { state: 'hidden' });
    expect((await horizontalOverflow(page)).overflowPx).toBe(0);
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
