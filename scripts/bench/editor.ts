import path from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { ROOT_DIR } from '../../server/paths';
import { CHROMIUM_PATH, CHROMIUM_ARGS } from '../../tests/helpers/browser';
import { buildClientIfStale } from '../buildClient';
import { CHROMIUM_PACKAGE, ensureDebianPackages } from '../db';
import { BENCH_DB, BENCH_PORTS, DEMO_PASSWORD, startApp } from './env';
import { atMost, info, median, percentile, say, type Figure } from './lib';

/**
 * Editor part of `npm run bench`: headless Chromium (as the end-to-end tests launch it) opens the demo design on
 * the Design desk and types single keystrokes into an input, one at a time, each after the previous one has
 * settled. Per keystroke it reads the performance marks the app leaves (composables/useEngine.ts,
 * components/plots/BasePlot.vue): keystroke → numbers on screen (`gw:numbers`, after the next paint) and
 * keystroke → every visible plot redrawn and painted (`gw:plot-drawn` of each plot). The first edit after a page
 * load is measured separately on fresh page loads.
 */
const EDITS = Number(process.env.BENCH_EDITS ?? 24);
const FIRST_EDIT_LOADS = Number(process.env.BENCH_FIRST_EDIT_LOADS ?? 5);
const FIELD = 'masses.toolKg';
const TABS = ['stiffness', 'speed'] as const;

/**
 * In the page: the times from the last keydown to the first `gw:numbers` mark after it and to the last of the
 * `gw:plot-drawn` marks of the visible plots, or null while any of them is missing. (No named inner functions:
 * tsx would wrap them in a helper that does not exist in the page, and the page's CSP forbids evaluating strings.)
 */
function settled(): EditTiming | null {
  // Runs in the page; typed loosely because this file is type-checked without the DOM library.
  type Mark = { name: string; startTime: number; detail?: { testId?: string } | null };
  type Plot = { offsetParent: unknown; dataset: { test?: string } };
  const page = globalThis as unknown as {
    __gwKeyAt?: number;
    performance: { getEntriesByType(type: string): Mark[] };
    document: { querySelector(sel: string): { querySelectorAll(sel: string): ArrayLike<Plot> } | null };
  };
  const t0 = page.__gwKeyAt;
  if (t0 === undefined) return null;
  const marks = page.performance.getEntriesByType('mark').filter((m) => m.startTime > t0);
  const numbers = marks.find((m) => m.name === 'gw:numbers');
  if (!numbers) return null;
  const sent = marks.find((m) => m.name === 'gw:evaluate');
  const result = marks.find((m) => m.name === 'gw:result');
  const panel = page.document.querySelector('#wb-panel');
  const plots = Array.from(panel ? panel.querySelectorAll('figure.plot[data-test]') : []).filter((el) => el.offsetParent !== null);
  let last = 0;
  for (const plot of plots) {
    const mark = marks.find((m) => m.name === 'gw:plot-drawn' && m.detail?.testId === plot.dataset.test);
    if (!mark) return null;
    last = Math.max(last, mark.startTime);
  }
  return {
    numbersMs: numbers.startTime - t0,
    plotsMs: (plots.length ? last : numbers.startTime) - t0,
    plots: plots.length,
    sentMs: sent ? sent.startTime - t0 : Number.NaN,
    resultMs: result ? result.startTime - t0 : Number.NaN,
  };
}

interface EditTiming {
  numbersMs: number;
  plotsMs: number;
  plots: number;
  /** Keystroke → evaluation sent to the worker (input handling and validation on the page). */
  sentMs: number;
  /** Keystroke → result back from the worker. */
  resultMs: number;
}

/** Presses one key in the field and waits until the numbers and every visible plot have been redrawn. */
async function timedKeystroke(page: Page, key: string): Promise<EditTiming> {
  const input = page.locator(`input[data-test="input-${FIELD}"]`);
  await page.evaluate(() => {
    const w = globalThis as unknown as {
      __gwKeyAt?: number;
      document: { addEventListener(type: string, fn: () => void, options: object): void };
    };
    w.__gwKeyAt = undefined;
    w.document.addEventListener('keydown', () => (w.__gwKeyAt = performance.now()), { once: true, capture: true });
  });
  await input.press(key);
  const handle = await page.waitForFunction(settled, null, { timeout: 10_000, polling: 'raf' });
  return (await handle.jsonValue()) as EditTiming;
}

async function openDesk(page: Page, base: string, id: number, tab: string): Promise<void> {
  await page.goto(`${base}/designs/${id}?tab=${tab}`);
  try {
    await page.waitForSelector(`input[data-test="input-${FIELD}"]`);
  } catch (err) {
    const shot = path.join(ROOT_DIR, '.data-bench', 'editor-failure.png');
    await page.screenshot({ path: shot, fullPage: true });
    throw new Error(`${(err as Error).message.split('\n')[0]} (screenshot: ${shot})`, { cause: err });
  }
  await page.waitForFunction(
    () => {
      const doc = (globalThis as unknown as { document: { querySelectorAll(sel: string): ArrayLike<{ dataset: { drawn?: string } }> } })
        .document;
      const plots = Array.from(doc.querySelectorAll('#wb-panel figure.plot[data-test]'));
      return plots.length > 0 && plots.every((p) => p.dataset.drawn === 'yes');
    },
    null,
    { timeout: 30_000 },
  );
  // Put the caret at the end of the field without typing (a click would not count as an edit).
  await page.locator(`input[data-test="input-${FIELD}"]`).focus();
  await page.keyboard.press('End');
}

export async function benchEditor(): Promise<Figure[]> {
  ensureDebianPackages([CHROMIUM_PACKAGE], say);
  await buildClientIfStale(say);
  const app = await startApp({ cwd: ROOT_DIR, port: BENCH_PORTS.app + 2, database: BENCH_DB, label: 'editor app' });
  const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: [...CHROMIUM_ARGS] });
  try {
    const context = await browser.newContext({ baseURL: app.url, viewport: { width: 1440, height: 900 } });
    const login = await context.request.post('/api/auth/login', { data: { email: 'designer@example.test', password: DEMO_PASSWORD } });
    if (!login.ok()) throw new Error(`sign-in failed: ${login.status()}`);
    // A fresh editable copy of the demo dispensing stage (41-point map), so every run types into the same inputs.
    const list = (await (await context.request.get('/api/designs?q=dispensing&pageSize=5&sort=name')).json()) as {
      items: { id: number; name: string }[];
    };
    const source = list.items.find((d) => d.name === 'Bench dispensing stage') ?? list.items[0];
    if (!source) throw new Error('the demo dispensing stage is missing from the bench database');
    const copy = await context.request.post('/api/designs', {
      data: { copyOf: source.id, name: `Editor bench ${new Date().toISOString()}` },
    });
    if (!copy.ok()) throw new Error(`copying the demo design failed: ${copy.status()} ${await copy.text()}`);
    const demo = (await copy.json()) as { id: number };
    const figures: Figure[] = [];
    for (const tab of TABS) {
      const page = await context.newPage();
      await openDesk(page, app.url, demo.id, tab);
      const timings: EditTiming[] = [];
      // BENCH_EDITOR_TRACE=<folder> writes a Chromium performance trace of each tab's keystrokes there.
      const traceDir = process.env.BENCH_EDITOR_TRACE;
      if (traceDir)
        await browser.startTracing(page, {
          path: path.join(traceDir, `editor-${tab}.json`),
          categories: ['devtools.timeline', 'blink.user_timing'],
        });
      for (let i = 0; i < EDITS; i++) {
        timings.push(await timedKeystroke(page, i % 2 === 0 ? '5' : 'Backspace'));
        await page.waitForTimeout(250);
      }
      if (traceDir) await browser.stopTracing();
      await page.close();
      const numbers = timings.map((t) => t.numbersMs);
      const plots = timings.map((t) => t.plotsMs);
      say(`editor: ${tab} tab, ${timings[0]?.plots} plots, numbers ${numbers.map((n) => n.toFixed(0)).join(' ')} ms`);
      figures.push(
        atMost(
          `editor.${tab}.numbers`,
          `keystroke → numbers, ${tab} tab (median)`,
          median(numbers),
          'ms',
          50,
          `${EDITS} keystrokes; p95 ${percentile(numbers, 95).toFixed(0)} ms; medians: evaluation sent ${median(timings.map((t) => t.sentMs)).toFixed(0)} ms, result back ${median(timings.map((t) => t.resultMs)).toFixed(0)} ms after the keystroke`,
        ),
        atMost(
          `editor.${tab}.plots`,
          `keystroke → ${timings[0]?.plots ?? 0} plots redrawn, ${tab} tab (median)`,
          median(plots),
          'ms',
          100,
          `${EDITS} keystrokes; p95 ${percentile(plots, 95).toFixed(0)} ms`,
        ),
      );
    }
    // The first edit after a page load (the engine worker is warmed while the design loads).
    const first: EditTiming[] = [];
    for (let i = 0; i < FIRST_EDIT_LOADS; i++) {
      const page = await context.newPage();
      await openDesk(page, app.url, demo.id, 'stiffness');
      first.push(await timedKeystroke(page, i % 2 === 0 ? '5' : 'Backspace'));
      await page.close();
    }
    figures.push(
      atMost(
        'editor.firstEdit.plots',
        'first keystroke after page load → plots redrawn (median)',
        median(first.map((t) => t.plotsMs)),
        'ms',
        100,
        `${FIRST_EDIT_LOADS} page loads; numbers ${median(first.map((t) => t.numbersMs)).toFixed(0)} ms`,
      ),
    );
    figures.push(
      info('editor.firstEdit.numbers', 'first keystroke after page load → numbers (median)', median(first.map((t) => t.numbersMs)), 'ms'),
    );
    await context.close();
    return figures;
  } finally {
    await browser.close();
    await app.stop();
  }
}
