import { describe, expect, it } from 'vitest';
import { CLAMP_ALLOWANCE_MM, defaultDesign, evaluateDesign, type DesignInput } from '@/engine';

function qty(rows: { item: string; quantity: number }[], item: string): number {
  return rows.filter((r) => r.item.startsWith(item)).reduce((s, r) => s + r.quantity, 0);
}

describe('partsList', () => {
  it.each([
    ['corexy', 1, 2, 2, 6, 2, 2, 0],
    ['hbot', 1, 2, 2, 2, 4, 1, 0],
    ['cartesian', 1, 2, 3, 3, 0, 3, 1],
    ['cartesian', 2, 3, 3, 3, 0, 3, 0],
  ] as const)(
    'when the %s layout (Y motors %i) is listed, then it needs %i motors, %i drive pulleys, %i toothed and %i smooth idlers, %i belts and %i cross shaft',
    (mech, yMotors, motors, drives, toothed, smooth, belts, shaft) => {
      const rows = evaluateDesign({ ...defaultDesign(mech), yMotors } as DesignInput).partsList;
      expect(qty(rows, 'Stepper motor')).toBe(motors);
      expect(qty(rows, 'Drive pulley')).toBe(drives);
      expect(qty(rows, 'Toothed idler')).toBe(toothed);
      expect(qty(rows, 'Smooth idler')).toBe(smooth);
      expect(qty(rows, 'Belt,')).toBe(belts);
      expect(qty(rows, 'Y cross shaft')).toBe(shaft);
    },
  );

  it('when the crossed-belt layout is listed, then each front corner is one row of two stacked idlers on two levels', () => {
    // Arrange
    const rows = evaluateDesign(defaultDesign('corexy')).partsList;
    // Act
    const stacked = rows.filter((r) => r.item.endsWith('stacked'));
    // Assert
    expect(stacked.map((r) => r.item)).toEqual(['Toothed idler A3 + B4, stacked', 'Toothed idler A4 + B3, stacked']);
    for (const r of stacked) {
      expect(r.quantity).toBe(2);
      expect(r.spec).toMatch(/stacked on one bolt, each on its own bearings/);
      expect(r.spec).toMatch(/lower level \(belt A\).*upper level \(belt B\)/);
    }
  });

  it.each([
    ['corexy', 'Drive pulley A2', /back-right corner, lower level \(belt A\); on the shaft of motor A/],
    ['corexy', 'Smooth idler B1', /gantry idler, left end, upper level \(belt B\); on its own bolt/],
    ['hbot', 'Smooth idler H4', /gantry idler, right end, back, belt level/],
    ['cartesian', 'Drive pulley YL1', /on the Y cross shaft, axis along X/],
    ['cartesian', 'Drive pulley X2', /gantry left end, gantry level \(belt X\); on the shaft of motor X, axis along Y/],
  ] as const)('when the %s layout is listed, then %s says where it sits and on what', (mech, item, spec) => {
    const row = evaluateDesign(defaultDesign(mech)).partsList.find((r) => r.item.startsWith(item));
    expect(row?.spec).toMatch(spec);
  });

  it('when a cartesian stage has two Y motors, then each Y drive pulley sits on its own motor', () => {
    const rows = evaluateDesign({ ...defaultDesign('cartesian'), yMotors: 2 } as DesignInput).partsList;
    expect(rows.find((r) => r.item === 'Drive pulley YR1')!.spec).toMatch(/on the shaft of its own Y motor/);
  });

  it('when every pulley row is counted, then it names each pulley of the drawing exactly once', () => {
    for (const mech of ['corexy', 'hbot', 'cartesian'] as const) {
      const r = evaluateDesign(defaultDesign(mech));
      const listed = r.partsList
        .filter((p) => /^(Drive pulley|Toothed idler|Smooth idler)/.test(p.item))
        .flatMap((p) => p.item.match(/\b(A|B|H|X|YL|YR)\d\b/g) ?? []);
      const drawn = r.layout.parts.filter((p) => p.kind !== 'clamp').map((p) => p.tag);
      expect([...listed].sort()).toEqual([...drawn].sort());
    }
  });

  it('when a belt is listed, then its cut length is whole teeth plus the clamp allowance at both ends', () => {
    const r = evaluateDesign(defaultDesign('corexy'));
    for (const b of r.belts) {
      expect(b.loopTeeth).toBe(Math.ceil(b.loopLengthMm / 2 - 1e-9));
      expect(b.cutLengthMm).toBeCloseTo(b.loopTeeth * 2 + 2 * CLAMP_ALLOWANCE_MM, 9);
      expect(r.partsList.find((p) => p.item === `Belt, ${b.label}`)!.spec).toContain(`cut ${b.cutLengthMm.toFixed(0)} mm`);
    }
  });
});
