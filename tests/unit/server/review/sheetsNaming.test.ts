import { describe, expect, it } from 'vitest';
import { sha256Hex, sheetFileName, slugify } from '../../../../server/services/sheets.service';

describe('slugify', () => {
  it.each([
    ['Bench dispensing stage', 'bench-dispensing-stage'],
    ['  A3 pen plotter (v2) ', 'a3-pen-plotter-v2'],
    ['Étagère à café', 'etagere-a-cafe'],
    ['√∞≈', 'design'],
    ['x'.repeat(100), 'x'.repeat(80)],
    // Cut at 80 characters right after a hyphen: the dangling hyphen goes too.
    [`${'abc-'.repeat(20)}xyz`, 'abc-'.repeat(20).slice(0, 79)],
  ])('when the name is %j, then the slug is %j', (name, slug) => {
    expect(slugify(name)).toBe(slug);
    expect(slugify(name)).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
  });
});

describe('sheetFileName', () => {
  it('when A4, then "<slug>-rev<N>.pdf"; when Letter, then "-letter" before the extension', () => {
    expect(sheetFileName('Label placer', 3, 'A4')).toBe('label-placer-rev3.pdf');
    expect(sheetFileName('Label placer', 3, 'LETTER')).toBe('label-placer-rev3-letter.pdf');
  });
});

describe('sha256Hex', () => {
  it('when hashing the empty input and "abc", then the published test vectors come out (FIPS 180-2, appendix B.1)', () => {
    expect(sha256Hex(Buffer.alloc(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
    expect(sha256Hex(Buffer.from('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});
