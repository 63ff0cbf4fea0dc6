import { existsSync, readFileSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { SHEET_FONTS, sheetFontFiles, woffToSfnt } from '../../../../server/sheet/fonts';

const require = createRequire(import.meta.url);
const fontkit = createRequire(require.resolve('pdfkit'))('fontkit') as {
  create(buffer: Buffer): { numGlyphs: number; characterSet: number[]; postscriptName: string; hasGlyphForCodePoint(cp: number): boolean };
};

describe('woffToSfnt', () => {
  it.each(Object.entries(SHEET_FONTS).flatMap(([family, styles]) => Object.entries(styles).map(([style, file]) => [family, style, file])))(
    'when %s %s is unwrapped, then the TrueType file has the same glyphs and characters as the .woff',
    (_family, _style, file) => {
      // Arrange
      const woff = readFileSync(file);

      // Act
      const sfnt = woffToSfnt(woff);

      // Assert
      const a = fontkit.create(woff);
      const b = fontkit.create(sfnt);
      expect(sfnt.readUInt32BE(0)).toBe(0x00010000);
      expect(b.postscriptName).toBe(a.postscriptName);
      expect(b.numGlyphs).toBe(a.numGlyphs);
      expect(b.characterSet).toEqual(a.characterSet);
    },
  );

  it('when given bytes that are not WOFF, then it refuses them', () => {
    expect(() => woffToSfnt(Buffer.from('not a font at all, not at all'))).toThrow(/not a WOFF/);
  });
});

describe('sheetFontFiles', () => {
  it('when asked twice, then it gives the same readable files inside its folder, one per family and style', () => {
    const first = sheetFontFiles();
    const second = sheetFontFiles();
    expect(second).toBe(first);
    expect(Object.keys(first.fonts).sort()).toEqual(Object.keys(SHEET_FONTS).sort());
    for (const styles of Object.values(first.fonts)) {
      for (const file of Object.values(styles)) {
        expect(existsSync(file), file).toBe(true);
        expect(path.dirname(file)).toBe(first.dir);
      }
    }
  });

  // fix: #12 — the fonts went to a predictable /tmp path that any local account could prepare in advance.
  it('when the fonts are unwrapped, then they go to a fresh folder only this account can enter, not a predictable path', () => {
    // Act
    const { dir } = sheetFontFiles();
    // Assert
    const version = (createRequire(import.meta.url)('@fontsource/inter/package.json') as { version: string }).version;
    expect(dir).not.toBe(path.join(os.tmpdir(), `gantrywright-sheet-fonts-${version}`));
    expect(path.basename(dir)).toMatch(/^gantrywright-sheet-fonts-[A-Za-z0-9]{6}$/);
    const stat = statSync(dir);
    expect(stat.mode & 0o777).toBe(0o700);
    expect(stat.uid).toBe(process.getuid!());
  });
});
