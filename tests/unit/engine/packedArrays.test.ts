import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import v8 from 'node:v8';
import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, type Mechanism } from '@/engine';
import { zeroRow } from '../../../src/engine/zeroRow';

// Every /api/calc answer is the result written as JSON, and V8's JSON encoder writes a holey array (one made with
// `new Array(n)`, however it is filled afterwards) element by element on a slower path: about 175 against 135 ns
// per number, some 30 % more for the 17,000 numbers of a demo answer (src/engine/zeroRow.ts). V8 answers whether an
// array is holey only through its native syntax, which this test switches on for the functions it compiles.
v8.setFlagsFromString('--allow-natives-syntax');
const isHoley = new Function('a', 'return %HasHoleyElements(a)') as (a: unknown[]) => boolean;

/** Paths of the holey arrays in a value ("[]" for any index). */
function holeyArrays(value: unknown, path = ''): string[] {
  if (Array.isArray(value)) {
    const own = isHoley(value) ? [path] : [];
    return [...own, ...new Set(value.flatMap((item) => holeyArrays(item, `${path}[]`)))];
  }
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => holeyArrays(v, `${path}.${k}`));
  return [];
}

const EXAMPLES = fileURLToPath(new URL('../../../reference/examples/', import.meta.url));
const demos = readdirSync(EXAMPLES).filter((f) => f.endsWith('.json'));

describe('arrays of a result are packed (the fast path of the JSON encoder)', () => {
  it('when asked whether arrays made with new Array(n) or filled in order are holey, then the probe tells them apart', () => {
    // The probe itself: without this, a probe that always said "packed" would pass every test below.
    expect(isHoley(new Array<number>(3).fill(0))).toBe(true);
    const filled: number[] = [];
    for (let i = 0; i < 3; i++) filled[i] = i / 2;
    expect(isHoley(filled)).toBe(false);
  });

  it('when a grid row is made, then it is packed, holds n zeros and its copies stay packed', () => {
    const row = zeroRow(41);
    expect(row).toEqual(new Array(41).fill(0));
    expect(isHoley(row)).toBe(false);
    const copy = row.slice();
    copy[7] = 0.25;
    expect(isHoley(copy)).toBe(false);
  });

  it.each(demos)('when the demo design %s is evaluated, then no array in its result is holey', (file) => {
    const design = JSON.parse(readFileSync(EXAMPLES + file, 'utf8'));
    expect(holeyArrays(evaluateDesign(design))).toEqual([]);
  });

  it.each(['corexy', 'hbot', 'cartesian'] as Mechanism[])(
    'when the %s template is evaluated at 101 points, then no array is holey',
    (m) => {
      expect(holeyArrays(evaluateDesign({ ...defaultDesign(m), map: { points: 101 } }))).toEqual([]);
    },
  );
});
