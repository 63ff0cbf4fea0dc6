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

  it('when a belt is listed, then its cut length is whole teeth plus the clamp allowance at both ends', () => {
    const r = evaluateDesign(defaultDesign('corexy'));
    for (const b of r.belts) {
      expect(b.loopTeeth).toBe(Math.ceil(b.loopLengthMm / 2 - 1e-9));
      expect(b.cutLengthMm).toBeCloseTo(b.loopTeeth * 2 + 2 * CLAMP_ALLOWANCE_MM, 9);
      expect(r.partsList.find((p) => p.item === `Belt, ${b.label}`)!.spec).toContain(`cut ${b.cutLengthMm.toFixed(0)} mm`);
    }
  });
});
