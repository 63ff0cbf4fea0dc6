import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const require = createRequire(import.meta.url);
/** axe-core's browser bundle, injected into the page under test. */
const AXE_PATH = require.resolve('axe-core');

/** One axe finding, trimmed to what a failure message needs. */
export interface A11yViolation {
  id: string;
  impact: string | null;
  help: string;
  targets: string[];
}

/**
 * Waits until the page's finite CSS transitions and animations have ended (at most 2 s): a control just clicked or a
 * dialog just opened fades between colours for a few hundred ms, and axe measuring the contrast of a half-faded
 * colour reports a violation the settled screen does not have. Endless ones (spinners) are not waited for.
 */
async function settleTransitions(page: Page): Promise<void> {
  await page.evaluate(async () => {
    const finite = document.getAnimations().filter((a) => a.effect?.getComputedTiming().iterations !== Infinity);
    const ended = Promise.all(finite.map((a) => a.finished.catch(() => undefined)));
    await Promise.race([ended, new Promise((resolve) => setTimeout(resolve, 2000))]);
  });
}

/**
 * Runs axe-core in the page (WCAG 2.x A and AA rules plus best practices) and returns the serious and critical
 * violations; minor and moderate findings are left to review. The page keeps the script between calls.
 * @param page - a page showing the screen to check
 * @param options.exclude - CSS selectors to leave out (third-party widgets only; say why at the call)
 */
export async function seriousViolations(page: Page, options: { exclude?: string[] } = {}): Promise<A11yViolation[]> {
  await settleTransitions(page);
  const hasAxe = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe !== 'undefined');
  if (!hasAxe) await page.addScriptTag({ path: AXE_PATH });
  const violations = await page.evaluate(async (exclude) => {
    type AxeResult = {
      violations: { id: string; impact: string | null; help: string; nodes: { target: unknown[] }[] }[];
    };
    const axe = (window as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<AxeResult> } }).axe;
    const context = exclude.length ? { include: [['body']], exclude: exclude.map((s) => [s]) } : document;
    const result = await axe.run(context, { resultTypes: ['violations'] });
    return result.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      targets: v.nodes.slice(0, 5).map((n) => n.target.join(' ')),
    }));
  }, options.exclude ?? []);
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

/**
 * How far the page is wider than the window [px] (0 when it fits), with the widest offending elements named, for
 * the "no sideways scrolling on a phone" rule.
 * @param page - a page showing the screen to check
 */
export async function horizontalOverflow(page: Page): Promise<{ overflowPx: number; culprits: string[] }> {
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const overflowPx = Math.max(0, document.documentElement.scrollWidth - width);
    const culprits = overflowPx
      ? [...document.querySelectorAll('body *')]
          .filter((el) => {
            const r = el.getBoundingClientRect();
            return r.width > 0 && r.right > width + 1 && getComputedStyle(el).position !== 'fixed';
          })
          .slice(0, 5)
          .map(
            (el) =>
              `${el.tagName.toLowerCase()}.${String((el as HTMLElement).className)
                .split(' ')
                .join('.')} → ${Math.round(el.getBoundingClientRect().right)} px`,
          )
      : [];
    return { overflowPx, culprits };
  });
}
