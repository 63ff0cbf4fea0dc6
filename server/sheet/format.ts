import { BASE_FONT, FALLBACK_FONTS, hasGlyph } from './fonts';

const MINUS = '\u2212';
const DASH = '\u2014';

/** Fixed decimals, true minus sign, em dash for a missing or non-finite number. */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  const rounded = Number(value.toFixed(decimals));
  const s = (Object.is(rounded, -0) ? 0 : rounded).toFixed(decimals);
  return s.startsWith('-') ? MINUS + s.slice(1) : s;
}

/** Approval time as an unambiguous UTC stamp, e.g. "2025-03-14 09:30 UTC". */
export function utcStamp(at: Date | string): string {
  const date = at instanceof Date ? at : new Date(at);
  if (Number.isNaN(date.getTime())) throw new Error(`[renderSheet] approval.approvedAt is not a date: ${String(at)}`);
  return `${date.toISOString().slice(0, 10)} ${date.toISOString().slice(11, 16)} UTC`;
}

/** One run of text in one font family. */
export interface TextRun {
  text: string;
  font?: string;
}

// Symbols the engine and users write that no Inter subset on the sheet carries: spelled out instead.
const SUBSTITUTES: [RegExp, string][] = [
  [/\s*\u2192\s*/g, ' to '],
  [/\s*\u2190\s*/g, ' from '],
  [/\u2264/g, '<='],
  [/\u2265/g, '>='],
  [/\u2248/g, '~'],
  [/\u221a/g, 'sqrt '],
  [/\u221e/g, 'infinity'],
  // Second moments of area (mm⁴, in⁴): the superscript four is in no subset the sheet embeds.
  [/\u2074/g, '^4'],
];

/** Replace symbols the sheet fonts lack by words or ASCII. */
export function spellSymbols(raw: string): string {
  return SUBSTITUTES.reduce((s, [re, to]) => s.replace(re, to), raw);
}

/**
 * Split text from users or the engine into runs the registered fonts can draw: a few symbols are spelled out,
 * characters the latin file lacks go to the first fallback subset that has them, and characters no subset has
 * become "?" so no missing-glyph box is printed. Control characters become spaces.
 */
export function userTextRuns(raw: string, bold = false, italics = false): TextRun[] {
  const runs: TextRun[] = [];
  for (const ch of Array.from(spellSymbols(raw).replace(/[\u0000-\u001f\u007f]/g, ' '))) {
    let family: string | undefined = BASE_FONT;
    if (!hasGlyph(BASE_FONT, bold, italics, ch)) family = FALLBACK_FONTS.find((f) => hasGlyph(f, bold, italics, ch));
    const out = family ? ch : '?';
    const font = family && family !== BASE_FONT ? family : undefined;
    const last = runs[runs.length - 1];
    if (last && last.font === font) last.text += out;
    else runs.push(font ? { text: out, font } : { text: out });
  }
  return runs.length ? runs : [{ text: '' }];
}
