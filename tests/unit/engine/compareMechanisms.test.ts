import { describe, expect, it } from 'vitest';
import { EngineInputError, compareMechanisms, defaultDesign } from '@/engine';

describe('compareMechanisms', () => {
  it('when one design is compared, then corexy, hbot and cartesian are evaluated side by side', () => {
    // Arrange
    const d = defaultDesign('corexy');
    // Act
    const { rows } = compareMechanisms(d);
    // Assert
    expect(rows.map((r) => r.mechanism)).toEqual(['corexy', 'hbot', 'cartesian']);
    const [cxy, hbot, cart] = rows;
    if (!cxy.ok || !hbot.ok || !cart.ok) throw new Error('all three should evaluate');
    expect(cxy.stepsPerMm).toBeCloseTo(cart.stepsPerMm, 12);
    // the smallest axis move is one belt microstep on both; the smallest diagonal move is 2× finer on crossed belts
    expect(cxy.microstep.axisMm).toBeCloseTo(cart.microstep.axisMm, 12);
    expect(cxy.microstep.diagonalMm).toBeCloseTo(cart.microstep.diagonalMm / 2, 12);
    expect(hbot.rackingMomentPerNewtonM).toBeGreaterThan(0);
    expect(cxy.rackingMomentPerNewtonM).toBe(0);
    expect(cart.movingMassKg.y).toBeGreaterThan(cxy.movingMassKg.y);
    expect(cxy.motorCount).toBe(2);
  });

  it('when a two-Y-motor cartesian design is compared, then the crossed-belt rows use two motors', () => {
    const { rows } = compareMechanisms({ ...defaultDesign('cartesian'), yMotors: 2 });
    const counts = rows.map((r) => (r.ok ? r.motorCount : -1));
    expect(counts).toEqual([2, 2, 3]);
  });

  it('when the design is invalid, then it throws instead of comparing', () => {
    expect(() => compareMechanisms({ ...defaultDesign('corexy'), pretensionN: -5 })).toThrow(EngineInputError);
  });
});
