import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign } from '@/engine';
import { limitingRanges, pullsAtLimit, splitBySign } from '@/views/desk/plotData';

describe('splitBySign', () => {
  it('when a series changes sign, then each part holds magnitudes and both meet at the crossing', () => {
    // Arrange
    const values = [1, 0.5, 0, -0.5, -1, -0.5, 0, 0.5];
    // Act
    const { positive, negative } = splitBySign(values);
    // Assert
    expect(positive).toEqual([1, 0.5, 0, null, null, null, 0, 0.5]);
    expect(negative).toEqual([null, null, 0, 0.5, 1, 0.5, 0, null]);
  });
});

describe('limitingRanges', () => {
  it('when motors take turns, then the ranges list each run of directions', () => {
    expect(limitingRanges(['A', 'A', 'B', 'B', 'B', 'A'])).toEqual({
      A: [
        [0, 1],
        [5, 5],
      ],
      B: [[2, 4]],
    });
  });
});

describe('pullsAtLimit', () => {
  it('when a crossed-belt stage accelerates along X, then both motors pull equally', () => {
    // Arrange: kinematics ΔA = ΔX + ΔY, ΔB = ΔX − ΔY (the crossed-belt relation published in 2012, docs/models/envelope.md §1)
    const result = evaluateDesign(defaultDesign('corexy'));
    // Act
    const pulls = pullsAtLimit(result, { x: 0, y: 0 });
    // Assert
    expect(pulls.a[0]).toBeCloseTo(pulls.b[0], 9);
  });

  it('when it accelerates along the diagonal, then motor B stands still yet holds the X/Y mass difference', () => {
    // Arrange: by virtual work [Fx, Fy] = Kᵀ·[FA, FB], so FB = ½(Fx − Fy) = ½·a·cos45°·(mX − mY) with B's belt at rest.
    const result = evaluateDesign(defaultDesign('corexy'));
    const a45 = result.envelope.accelMaxMPerS2[45];
    const expected = 0.5 * a45 * Math.SQRT1_2 * Math.abs(result.mass.xKg - result.mass.yKg);
    // Act
    const pulls = pullsAtLimit(result, { x: 0, y: 0 });
    // Assert
    expect(result.coupling.speedShare.b[45]).toBeCloseTo(0, 9);
    expect(pulls.b[45]).toBeCloseTo(expected, 6);
    expect(pulls.a[45]).toBeGreaterThan(pulls.b[45]);
  });
});
