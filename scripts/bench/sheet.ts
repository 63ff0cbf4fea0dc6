import { performance } from 'node:perf_hooks';
import { renderSheets } from '../../server/workers/tasks';
import { exampleSheetInput } from '../../tests/unit/server/sheet/fixtures/sheetInput';
import { info, median, say, type Figure } from './lib';

/**
 * Sheet part of `npm run bench`: what one approval costs in its PDF thread, measured by running the PDF pool's own
 * task (renderSheets in server/workers/tasks.ts: the example design's sheet in A4 and US Letter, and their SHA-256)
 * in this process. The first pair is a new thread's (pdfmake, fonts and the code loading and being optimised); the
 * median of the following pairs is a warm thread's, which keeps the words it has shaped
 * (server/sheet/shapingCache.ts). No target: the figures track the renderer, and
 * the server part measures what the renders do to other requests.
 */
const PAIRS = Number(process.env.BENCH_SHEET_PAIRS ?? 10);

export async function benchSheet(): Promise<Figure[]> {
  const input = exampleSheetInput();
  const pairMs: number[] = [];
  for (let i = 0; i <= PAIRS; i++) {
    const t0 = performance.now();
    await renderSheets(input);
    pairMs.push(performance.now() - t0);
  }
  const [first, ...warm] = pairMs;
  say(`sheet: first pair ${first.toFixed(0)} ms, then ${warm.map((t) => t.toFixed(0)).join(', ')} ms`);
  return [
    info('sheet.first', 'design sheet, A4 + Letter, first pair in a new thread', first, 'ms'),
    info('sheet.warm', 'design sheet, A4 + Letter, warm thread (median)', median(warm), 'ms', 'lower', `${warm.length} pairs`),
  ];
}
