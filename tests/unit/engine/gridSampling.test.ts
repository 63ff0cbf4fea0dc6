import { describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, gridStride, sampledGridMap } from '@/engine';

describe('sampledGridMap', () => {
  it('when the stride is 1, then every point is the exact value', () => {
    // Arrange
    const f = (ix: number, iy: number) => Math.sin(ix) + iy * iy;
    // Act
    const r = sampledGridMap(7, 5, 1, f, 'max');
    // Assert
    for (let iy = 0; iy < 5; iy++) for (let ix = 0; ix < 7; ix++) expect(r.values[iy][ix]).toBe(f(ix, iy));
    expect(r.values[r.iy][r.ix]).toBe(Math.max(...r.values.flat()));
  });

  it('when a smooth field is sampled every third point, then it stays within 0.5 % of exact and its minimum is exact', () => {
    // Arrange: a smooth bowl with its minimum between sample nodes
    const f = (ix: number, iy: number) => 50 + 0.02 * (ix - 47.3) ** 2 + 0.015 * (iy - 62.6) ** 2;
    // Act
    const r = sampledGridMap(101, 101, 3, f, 'min');
    // Assert
    let worst = 0;
    for (let iy = 0; iy < 101; iy++) for (let ix = 0; ix < 101; ix++) worst = Math.max(worst, Math.abs(r.values[iy][ix] / f(ix, iy) - 1));
    expect(worst).toBeLessThan(0.005);
    expect([r.ix, r.iy]).toEqual([47, 63]);
    expect(r.values[63][47]).toBe(f(47, 63));
  });
});

describe('gridStride', () => {
  it.each([
    [41, 1],
    [61, 2],
    [101, 3],
  ])('when the map has %d points per axis, then every %d-th is solved exactly', (points, stride) => {
    expect(gridStride(points)).toBe(stride);
  });
});

describe('the sampled second-layer maps of a design', () => {
  it.each(['corexy', 'cartesian'] as const)(
    'when a %s stage is mapped on 101 × 101 points, then the error and lowest-mode maps are within 1 % of the 41-point exact ones where the grids meet, with the same worst values',
    (mech) => {
      // Arrange: a 101-point grid and a 26-point grid share every fourth point (0, 4, …, 100 ↔ 0, 1, …, 25)
      const d = defaultDesign(mech);
      // Act
      const fine = evaluateDesign({ ...d, map: { points: 101 } });
      const exact = evaluateDesign({ ...d, map: { points: 26 } });
      // Assert
      let err = 0;
      let low = 0;
      for (let iy = 0; iy < 26; iy++)
        for (let ix = 0; ix < 26; ix++) {
          err = Math.max(err, Math.abs(fine.errorBudget.totalMm[iy * 4][ix * 4] / exact.errorBudget.totalMm[iy][ix] - 1));
          low = Math.max(
            low,
            Math.abs(fine.stiffness.lowestMap.frequencyHz[iy * 4][ix * 4] / exact.stiffness.lowestMap.frequencyHz[iy][ix] - 1),
          );
        }
      expect(err).toBeLessThan(0.01);
      expect(low).toBeLessThan(0.01);
      expect(fine.errorBudget.worst.totalMm).toBeGreaterThanOrEqual(exact.errorBudget.worst.totalMm * (1 - 1e-9));
      expect(fine.stiffness.lowest.frequencyHz).toBeLessThanOrEqual(exact.stiffness.lowest.frequencyHz * (1 + 1e-9));
    },
  );
});
