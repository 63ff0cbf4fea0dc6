import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it, vi } from 'vitest';
import { BASE_FONT, sheetFontFiles } from '../../../../server/sheet/fonts';
import { renderSheet } from '../../../../server/sheet/renderSheet';
import { clearShapingCache, installShapingCache, MAX_RUNS, shapingCacheStats } from '../../../../server/sheet/shapingCache';
import { designFor, exampleSheetInput } from './fixtures/sheetInput';

vi.setConfig({ testTimeout: 60_000 });

const require = createRequire(import.meta.url);
const fontkit = require('fontkit') as {
  create(bytes: Uint8Array): { layout(text: string, features?: unknown): { positions: { xAdvance: number }[]; advanceWidth: number } };
};

function interFont() {
  const file = sheetFontFiles().fonts[BASE_FONT].normal;
  installShapingCache(file);
  return fontkit.create(readFileSync(file));
}

describe('shaping cache of the sheet renderer', () => {
  it('when a sheet is rendered again, then its words come from the cache and the bytes are the same', async () => {
    clearShapingCache();
    const input = exampleSheetInput();
    const first = await renderSheet(input);
    const afterFirst = shapingCacheStats();
    expect(afterFirst.misses).toBeGreaterThan(100);
    const again = await renderSheet(input);
    const afterAgain = shapingCacheStats();
    // Nothing new to shape the second time, and every word of it was found.
    expect(afterAgain.misses).toBe(afterFirst.misses);
    expect(afterAgain.hits - afterFirst.hits).toBe(afterFirst.misses + afterFirst.hits);
    expect(again.equals(first)).toBe(true);
  });

  it('when another design follows, then its sheet is the one rendered with an empty cache', async () => {
    const other = exampleSheetInput({}, designFor('hbot'));
    await renderSheet(exampleSheetInput());
    const warm = await renderSheet(other);
    clearShapingCache();
    const cold = await renderSheet(other);
    expect(warm.equals(cold)).toBe(true);
  });

  it('when a cached run is scaled in place by its caller (as pdfkit does), then the next caller gets the unscaled run', () => {
    clearShapingCache();
    const font = interFont();
    const a = font.layout('Pretension');
    const width = a.advanceWidth;
    for (const p of a.positions) p.xAdvance *= 0.5;
    const b = font.layout('Pretension');
    expect(shapingCacheStats().hits).toBe(1);
    expect(b.positions).not.toBe(a.positions);
    expect(b.advanceWidth).toBe(width);
  });

  it('when features are given, then the text is shaped afresh and not kept', () => {
    clearShapingCache();
    const font = interFont();
    font.layout('tabular 0123', ['tnum']);
    expect(shapingCacheStats()).toEqual({ hits: 0, misses: 0, size: 0 });
  });

  it('when more distinct words than the limit are shaped, then the cache never holds more than the limit', () => {
    clearShapingCache();
    const font = interFont();
    for (let i = 0; i <= MAX_RUNS + 10; i++) font.layout(`w${i}`);
    expect(shapingCacheStats().size).toBeLessThanOrEqual(MAX_RUNS);
    expect(shapingCacheStats().size).toBeGreaterThan(0);
  });
});
