import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { conversionFactor, QUANTITIES } from '@/format/displayUnits';
import { UNIT_TABLE } from '@/format/unitTable';
import { siOf, unitMath } from '../../../scripts/genUnitTable';

const math = unitMath();

/** Every literal `stored="…"` / `stored: '…'` unit string in the client's source (bound `:stored` props excluded). */
function storedUnitsInSource(): string[] {
  const found = new Set<string>();
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.(ts|vue)$/.test(entry.name)) {
        const text = fs.readFileSync(full, 'utf8');
        for (const m of text.matchAll(/(?<![:\w])stored(?:="|: ')([^"'{}]*)["']/g)) if (m[1]) found.add(m[1]);
      }
    }
  };
  walk(path.join(import.meta.dirname, '../../../src'));
  return [...found];
}

describe('UNIT_TABLE', () => {
  it.each(Object.keys(UNIT_TABLE))('when %s is looked up, then its SI value and dimension equal mathjs (library)', (unit) => {
    // Arrange
    const expected = siOf(math, unit);

    // Act
    const entry = UNIT_TABLE[unit];

    // Assert
    expect(entry.dim).toBe(expected.dim);
    expect(entry.si).toBeCloseTo(expected.si, 15);
  });

  it('when the client shows or stores a unit, then the table has it', () => {
    const display = Object.values(QUANTITIES).flatMap((q) => [q.metric.unit, q.imperial.unit]);

    const missing = [...display, ...storedUnitsInSource()].filter((u) => u && !(u in UNIT_TABLE));

    expect(missing).toEqual([]);
  });

  it.each([
    ['mm', 'in'],
    ['N m', 'ozf in'],
    ['N m', 'lbf in'],
    ['kg m^2', 'oz in^2'],
    ['kg/m', 'oz/ft'],
    ['m/s^2', 'in/s^2'],
    ['mm^-1', 'in^-1'],
  ])('when %s is converted to %s, then the factor is mathjs’s to 1e-12 (library)', (from, to) => {
    const expected = (math.unit(1, from) as unknown as { toNumber(u: string): number }).toNumber(to);

    const factor = conversionFactor(from, to);

    expect(Math.abs(factor / expected - 1)).toBeLessThan(1e-12);
  });

  it('when two units measure different things, then the conversion is refused', () => {
    expect(() => conversionFactor('mm', 'kg')).toThrow(/measure different things/);
  });
});
