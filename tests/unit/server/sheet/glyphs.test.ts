import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { SHEET_FONTS } from '../../../../server/sheet/fonts';
import { buildSheetDoc } from '../../../../server/sheet/renderSheet';
import { docChars, type PlacedChar } from './docText';
import { designFor, exampleSheetInput } from './fixtures/sheetInput';

// The fontkit that pdfkit (pdfmake's PDF writer) embeds fonts with, resolved from pdfkit's own folder.
const require = createRequire(import.meta.url);
const fontkit = createRequire(require.resolve('pdfkit'))('fontkit') as {
  openSync(file: string): { hasGlyphForCodePoint(codePoint: number): boolean };
};
const fonts = new Map<string, { hasGlyphForCodePoint(codePoint: number): boolean }>();
function open(file: string) {
  let font = fonts.get(file);
  if (!font) {
    font = fontkit.openSync(file);
    fonts.set(file, font);
  }
  return font;
}

/** Characters whose font file has no glyph for them, as "char U+XXXX in file at path". */
function missingGlyphs(chars: PlacedChar[]): string[] {
  const missing = new Set<string>();
  for (const { char, file, where } of chars) {
    const cp = char.codePointAt(0) ?? 0;
    if (!open(file).hasGlyphForCodePoint(cp)) {
      missing.add(`"${char}" U+${cp.toString(16).toUpperCase().padStart(4, '0')} in ${file.split('/').pop()} at ${where}`);
    }
  }
  return [...missing];
}

describe('buildSheetDoc glyph coverage', () => {
  it.each(['A4', 'LETTER'] as const)(
    'when the example design is laid out on %s, then every character exists in the font it is drawn with',
    (paper) => {
      // Arrange
      const doc = buildSheetDoc(exampleSheetInput({ paper }));

      // Act
      const chars = docChars(doc);

      // Assert
      expect(chars.length).toBeGreaterThan(3000);
      expect(chars.some((c) => c.where.endsWith('svg'))).toBe(true);
      expect(chars.some((c) => c.where.startsWith('footer'))).toBe(true);
      expect(missingGlyphs(chars)).toEqual([]);
    },
  );

  it.each(['hbot', 'cartesian'] as const)(
    'when the mechanism is %s, then every character exists in the font it is drawn with',
    (mechanism) => {
      const chars = docChars(buildSheetDoc(exampleSheetInput({}, designFor(mechanism, { yMotors: mechanism === 'cartesian' ? 2 : 1 }))));
      expect(chars.length).toBeGreaterThan(3000);
      expect(missingGlyphs(chars)).toEqual([]);
    },
  );

  it('when names and the comment hold letters beyond latin, then each goes to a subset that has it, arrows are spelled out and the rest become "?"', () => {
    // Arrange: Polish, Greek and Cyrillic letters have subsets; CJK and an emoji have none.
    const input = exampleSheetInput({
      designName: 'Étagère Łódź — Δοκιμή',
      designer: { name: 'Ζωή Παπαδοπούλου', email: 'zoe@example.test' },
      approval: { reviewerName: 'Пётр Смирнов', approvedAt: new Date('2025-03-14T09:30:00Z'), comment: '良い 🚀 ok → next' },
    });

    // Act
    const chars = docChars(buildSheetDoc(input));
    const text = chars.map((c) => c.char).join('');

    // Assert
    expect(missingGlyphs(chars)).toEqual([]);
    expect(chars.some((c) => c.char === 'Δ' && c.file.includes('greek'))).toBe(true);
    expect(chars.some((c) => c.char === 'Ł' && c.file.includes('latin-ext'))).toBe(true);
    expect(chars.some((c) => c.char === 'П' && c.file.includes('cyrillic'))).toBe(true);
    expect(text).not.toContain('良');
    expect(text).not.toContain('→');
    expect(text).toContain('?? ? ok to next');
  });

  it('when a character the latin file lacks is put into the doc, then the walker reports it (negative control)', () => {
    // Arrange
    const doc = buildSheetDoc(exampleSheetInput());
    (doc.content as unknown[]).push(
      { text: 'a ≤ b' },
      { svg: '<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><text font-family="Inter" x="0" y="5">ω</text></svg>' },
    );

    // Act
    const missing = missingGlyphs(docChars(doc));

    // Assert
    expect(missing).toHaveLength(2);
    expect(missing[0]).toContain('U+2264');
    expect(missing[1]).toContain('U+03C9');
  });

  it('when fonts are registered, then every family has all four styles as .woff files', () => {
    for (const [family, styles] of Object.entries(SHEET_FONTS)) {
      expect(Object.keys(styles).sort(), family).toEqual(['bold', 'bolditalics', 'italics', 'normal']);
      for (const file of Object.values(styles)) expect(file.endsWith('.woff'), file).toBe(true);
    }
  });
});
