import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

/**
 * Text shaping shared by every sheet a thread renders.
 *
 * pdfkit (under pdfmake) lays text out word by word and keeps each word's glyph run in a cache, but that cache
 * belongs to one document: every sheet shapes every word again, through the font's OpenType substitution tables
 * (Inter has many contextual ones), and that was about a third of a sheet's render time. Two renders of the same
 * sheet shape the same words with the same font file, so this keeps the runs of fontkit's `layout` (the shaper
 * pdfkit calls) for the whole thread, keyed by the font (its PostScript name and checksum, the identity pdfkit itself
 * compares fonts by) and the text. Measured on the example sheet: 0.56 → 0.36 s per warm render, the same bytes.
 *
 * Each call gets a copy of the cached run with positions of its own, because pdfkit scales the positions it gets
 * in place (font units to PDF units). Calls with explicit OpenType features, a script, a language or a direction are
 * not cached (the sheet makes none). The cache is cleared when it reaches {@link MAX_RUNS} runs, which bounds its
 * memory whatever the designs' names and numbers are.
 */

/** Runs kept per thread before the cache starts again (a sheet shapes some 1,500 distinct words). */
export const MAX_RUNS = 20_000;

interface GlyphPositionLike {
  xAdvance: number;
  yAdvance: number;
  xOffset: number;
  yOffset: number;
}

interface GlyphRunLike {
  glyphs: unknown[];
  positions: GlyphPositionLike[];
}

interface FontLike {
  postscriptName: string;
  /** The font's head table (decoded on first read). */
  head?: { checkSumAdjustment?: number };
  layout(text: string, ...rest: unknown[]): GlyphRunLike;
}

const runs = new Map<string, GlyphRunLike>();
const counts = { hits: 0, misses: 0 };
let installed = false;

/** A run whose positions are new objects with the same values (the glyphs, read only, are shared). */
function copyRun(run: GlyphRunLike): GlyphRunLike {
  const copy = Object.assign(Object.create(Object.getPrototypeOf(run) as object) as GlyphRunLike, run);
  copy.positions = run.positions.map((p) => Object.assign(Object.create(Object.getPrototypeOf(p) as object) as GlyphPositionLike, p));
  return copy;
}

/**
 * Puts the shared cache in front of fontkit's `layout` for this thread (once; later calls do nothing).
 * @param sampleFontFile - a font file fontkit can open, to reach the class that lays text out
 * @throws Error when fontkit's font class has no `layout` method (a fontkit this module was not written for)
 */
export function installShapingCache(sampleFontFile: string): void {
  if (installed) return;
  const require = createRequire(import.meta.url);
  const fontkit = require('fontkit') as { create(bytes: Uint8Array): FontLike };
  // The prototype that defines layout (TrueType; WOFF fonts inherit it).
  let proto = Object.getPrototypeOf(fontkit.create(readFileSync(sampleFontFile))) as Record<string, unknown> | null;
  while (proto && !Object.hasOwn(proto, 'layout')) proto = Object.getPrototypeOf(proto) as Record<string, unknown> | null;
  if (!proto || typeof proto.layout !== 'function') throw new Error('[shapingCache] fontkit fonts have no layout method');
  const layout = proto.layout as FontLike['layout'];
  proto.layout = function cachedLayout(this: FontLike, text: string, ...rest: unknown[]): GlyphRunLike {
    if (rest.some((arg) => arg !== undefined) || typeof text !== 'string') return layout.call(this, text, ...rest);
    const key = `${this.postscriptName}\u0000${this.head?.checkSumAdjustment ?? ''}\u0000${text}`;
    let run = runs.get(key);
    if (run) counts.hits++;
    else {
      counts.misses++;
      if (runs.size >= MAX_RUNS) runs.clear();
      run = layout.call(this, text);
      runs.set(key, run);
    }
    return copyRun(run);
  };
  installed = true;
}

/** Hits, misses and runs held, for tests. */
export function shapingCacheStats(): { hits: number; misses: number; size: number } {
  return { ...counts, size: runs.size };
}

/** Empties the cache and its counts (tests). */
export function clearShapingCache(): void {
  runs.clear();
  counts.hits = 0;
  counts.misses = 0;
}
