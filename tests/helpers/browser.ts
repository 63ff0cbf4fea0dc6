import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';

/**
 * Debian's chromium driven by playwright-core (browser downloads do not work here).
 *
 * Profile: `chromium.launch()` gives every browser a fresh temporary `--user-data-dir`
 * (playwright_chromiumdev_profile-*) and deletes it on close; Playwright refuses an explicit
 * `--user-data-dir` argument to `launch()`. Each test then opens its own context, so cookies and
 * localStorage never leak between journeys.
 */

/** Where Debian installs chromium. */
export const CHROMIUM_PATH = '/usr/bin/chromium';

/** Flags that keep headless chromium quiet and offline apart from the app under test. */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
] as const;

/**
 * Starts headless chromium. Close it in `afterAll` ({@link useBrowser} does both).
 * @param extraArgs - more command-line switches, e.g. {@link fakeMicrophoneArgs}
 */
export function launchBrowser(extraArgs: readonly string[] = []): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: [...CHROMIUM_ARGS, ...extraArgs] });
}

/**
 * Launches chromium before the tests of the enclosing `describe` and closes it after them (one browser per file;
 * each test opens its own context with {@link openPage}).
 * @param extraArgs - more switches, or a function that gives them when the browser starts (it runs after the
 *   `beforeAll` hooks registered before this call, e.g. one that writes a file the switches name)
 * @returns the running browser
 */
export function useBrowser(extraArgs: readonly string[] | (() => readonly string[]) = []): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser(typeof extraArgs === 'function' ? extraArgs() : extraArgs);
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('no browser: useBrowser() belongs in a describe block, and its browser is used inside the tests');
    return browser;
  };
}

/**
 * Switches that make chromium grant the microphone without asking and play a WAV file as its input (the file loops),
 * so a journey can record "from the microphone".
 * @param wavPath - a 16-bit PCM WAV on disk
 */
export function fakeMicrophoneArgs(wavPath: string): string[] {
  return ['--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream', `--use-file-for-fake-audio-capture=${wavPath}`];
}

/** A page in its own context, with the uncaught page errors it raised. */
export interface OpenPage {
  context: BrowserContext;
  page: Page;
  /** Uncaught exceptions in the page (a healthy journey has none). */
  pageErrors: string[];
}

/** Options of {@link openPage}. */
export interface OpenPageOptions {
  baseURL: string;
  width?: number;
  height?: number;
  colorScheme?: 'light' | 'dark';
  /**
   * Let the test inject scripts the app's Content-Security-Policy would refuse (axe-core for the accessibility check).
   * The app itself runs unchanged.
   */
  bypassCSP?: boolean;
}

/**
 * Opens a fresh context (no cookies, no storage) and one page in it.
 * @param browser - from {@link launchBrowser}
 * @param options - base URL of the app, viewport and colour scheme
 */
export async function openPage(browser: Browser, options: OpenPageOptions): Promise<OpenPage> {
  const context = await browser.newContext({
    baseURL: options.baseURL,
    viewport: { width: options.width ?? 1280, height: options.height ?? 800 },
    colorScheme: options.colorScheme ?? 'light',
    bypassCSP: options.bypassCSP ?? false,
  });
  context.setDefaultTimeout(15_000);
  const page = await context.newPage();
  const pageErrors: string[] = [];
  page.on('pageerror', (err) => pageErrors.push(err.message));
  return { context, page, pageErrors };
}

/** Password of every demo account (seeded by the e2e global setup). */
export const DEMO_PASSWORD = 'gantry-demo';

/**
 * Signs in through the sign-in form (the page must show it) and waits until the app shell is there.
 * @param page - a page on /sign-in
 * @param email - account e-mail
 * @param password - defaults to the demo password
 */
export async function signInThroughForm(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.fill('[data-test="sign-in-email"]', email);
  await page.fill('[data-test="sign-in-password"]', password);
  await page.click('[data-test="sign-in-submit"]');
  // The app shell's main area: on a phone the navigation sits in a closed drawer, so it is not waited for.
  await page.waitForSelector('[data-test="main"]');
}

/** The `nav-<key>` keys of the visible navigation, in order. */
export async function navKeys(page: Page): Promise<string[]> {
  return page.$$eval('[data-test^="nav-"]', (els) => els.map((el) => (el.getAttribute('data-test') ?? '').replace(/^nav-/, '')));
}

/** Opens the account menu (unless it is open already) and signs out; waits for the sign-in page. */
export async function signOut(page: Page): Promise<void> {
  // Clicking the menu button while the menu is open would close it again.
  if (!(await page.isVisible('[data-test="sign-out"]'))) await page.click('[data-test="user-menu"]');
  await page.click('[data-test="sign-out"]');
  await page.waitForURL((url) => url.pathname === '/sign-in');
}

/** Waits until the page shows the sign-in form for a visitor who was on their way to `next`. */
export async function waitForSignInWithNext(page: Page, next: string): Promise<void> {
  await page.waitForURL((url) => url.pathname === '/sign-in' && url.searchParams.get('next') === next);
}
