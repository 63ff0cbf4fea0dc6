import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { inflateSync } from 'node:zlib';

const require = createRequire(import.meta.url);

/** Folder that holds the @fontsource/inter font files; the only local path pdfmake may read. */
export const FONT_DIR: string = path.dirname(require.resolve('@fontsource/inter/files/inter-latin-400-normal.woff'));

type FontStyle = 'normal' | 'bold' | 'italics' | 'bolditalics';

/** A family name as used in the doc definition, mapped to the .woff file for each style. */
export type FontFamilies = Record<string, Record<FontStyle, string>>;

// The .woff files, not .woff2: pdfkit's woff2 decoder crashes on some Inter glyphs (seen with Inter 5.3 and pdfkit 0.19).
function interSubset(subset: string): Record<FontStyle, string> {
  const file = (weight: number, style: 'normal' | 'italic'): string => path.join(FONT_DIR, `inter-${subset}-${weight}-${style}.woff`);
  return { normal: file(400, 'normal'), bold: file(700, 'normal'), italics: file(400, 'italic'), bolditalics: file(700, 'italic') };
}

/**
 * Families registered with pdfmake. `Inter` (latin subset) sets every fixed text of the sheet; the other
 * subsets only carry runs of user-entered text (names, comments) whose characters the latin file lacks.
 */
export const SHEET_FONTS: FontFamilies = {
  Inter: interSubset('latin'),
  InterLatinExt: interSubset('latin-ext'),
  InterGreek: interSubset('greek'),
  InterCyrillic: interSubset('cyrillic'),
};

/** The family every fixed text and every SVG text of the sheet uses. */
export const BASE_FONT = 'Inter';

/** Families tried in order for a character of user text the base family lacks. */
export const FALLBACK_FONTS: readonly string[] = ['InterLatinExt', 'InterGreek', 'InterCyrillic'];

/** Path of the font file pdfmake picks for a family and style. */
export function fontFile(family: string, bold: boolean, italics: boolean): string {
  const styles = SHEET_FONTS[family];
  if (!styles) throw new Error(`[sheet] font family ${family} is not registered`);
  const style: FontStyle = bold ? (italics ? 'bolditalics' : 'bold') : italics ? 'italics' : 'normal';
  return styles[style];
}

interface FontkitFont {
  hasGlyphForCodePoint(codePoint: number): boolean;
}
interface Fontkit {
  openSync(file: string): FontkitFont;
}

// fontkit is the font parser pdfkit itself embeds with; resolve it from pdfkit's own location so the sheet
// checks coverage with exactly the library that draws the glyphs.
const requireFromPdfkit = createRequire(require.resolve('pdfkit'));
const fontkit = requireFromPdfkit('fontkit') as Fontkit;
const openFonts = new Map<string, FontkitFont>();

/** Open (once) a font file with the fontkit pdfkit uses. */
export function openFont(file: string): FontkitFont {
  let font = openFonts.get(file);
  if (!font) {
    font = fontkit.openSync(file);
    openFonts.set(file, font);
  }
  return font;
}

/** True when the font file of a family/style has a real glyph for the character. */
export function hasGlyph(family: string, bold: boolean, italics: boolean, char: string): boolean {
  const codePoint = char.codePointAt(0);
  if (codePoint === undefined) return true;
  return openFont(fontFile(family, bold, italics)).hasGlyphForCodePoint(codePoint);
}

/**
 * Repackage a WOFF 1.0 font as the plain TrueType/OpenType file it wraps: every table inflated, same bytes
 * otherwise. fontkit inflates a WOFF's glyph table again on every glyph it reads, which made a sheet cost seconds
 * of CPU; pdfkit embeds the same glyphs from the unwrapped file at once.
 * @see W3C WOFF File Format 1.0 (2012), §3–5 (header, table directory, table data)
 * @param woff - the .woff file's bytes
 * @returns the sfnt bytes
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('[woffToSfnt] not a WOFF 1.0 file');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i += 1) {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const raw = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(raw) : Buffer.from(raw);
    if (data.length !== origLength) throw new Error('[woffToSfnt] a table does not inflate to its stated length');
    tables.push({ tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data });
  }
  tables.sort((a, b) => a.tag - b.tag);
  const pow2 = 2 ** Math.floor(Math.log2(numTables));
  const header = Buffer.alloc(12 + 16 * numTables);
  header.writeUInt32BE(flavor, 0);
  header.writeUInt16BE(numTables, 4);
  header.writeUInt16BE(pow2 * 16, 6);
  header.writeUInt16BE(Math.log2(pow2), 8);
  header.writeUInt16BE(numTables * 16 - pow2 * 16, 10);
  const chunks: Buffer[] = [header];
  let offset = header.length;
  tables.forEach((t, i) => {
    header.writeUInt32BE(t.tag, 12 + i * 16);
    header.writeUInt32BE(t.checksum, 16 + i * 16);
    header.writeUInt32BE(offset, 20 + i * 16);
    header.writeUInt32BE(t.data.length, 24 + i * 16);
    const padded = Buffer.alloc((t.data.length + 3) & ~3);
    t.data.copy(padded);
    chunks.push(padded);
    offset += padded.length;
  });
  return Buffer.concat(chunks);
}

let unwrapped: { dir: string; fonts: FontFamilies } | null = null;

/**
 * The sheet fonts as plain TrueType files, unwrapped once per process from the .woff files into a private folder of
 * its own: created under the system temp folder with a random name and mode 0700, so no other account can read,
 * replace or plant a file there (a predictable /tmp path let anyone prepare a font for the next process; issue 12,
 * item 10). pdfkit opens SVG text fonts by path, so an in-memory copy would not reach the plots. The folder is
 * removed when the process exits. If it cannot be written, the .woff files themselves are used: slower, same glyphs.
 * @returns the folder pdfmake may read and the family → style → file table for pdfmake.setFonts
 */
export function sheetFontFiles(): { dir: string; fonts: FontFamilies } {
  if (unwrapped) return unwrapped;
  try {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'gantrywright-sheet-fonts-'));
    process.once('exit', () => rmSync(dir, { recursive: true, force: true }));
    const fonts: FontFamilies = {};
    for (const [family, styles] of Object.entries(SHEET_FONTS)) {
      const entry = {} as Record<FontStyle, string>;
      for (const [style, file] of Object.entries(styles) as [FontStyle, string][]) {
        const target = path.join(dir, `${path.basename(file, '.woff')}.ttf`);
        // 'wx': the folder is new and ours, so the file must not exist yet.
        writeFileSync(target, woffToSfnt(readFileSync(file)), { mode: 0o600, flag: 'wx' });
        entry[style] = target;
      }
      fonts[family] = entry;
    }
    unwrapped = { dir, fonts };
  } catch {
    unwrapped = { dir: FONT_DIR, fonts: SHEET_FONTS };
  }
  return unwrapped;
}
