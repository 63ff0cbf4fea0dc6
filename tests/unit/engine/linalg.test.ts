import { describe, expect, it } from 'vitest';
import { apply2, det2, inverse2, lowestEigenvalue2, multiply2, transpose2, type Matrix2 } from '@/engine';

describe('inverse2', () => {
  it.each([
    [
      [
        [1, 1],
        [1, -1],
      ],
    ],
    [
      [
        [2, 0.5],
        [-1, 3],
      ],
    ],
  ] as [Matrix2][])('when %j is inverted, then the product with it is the identity', (m) => {
    const p = multiply2(m, inverse2(m));
    expect(p[0][0]).toBeCloseTo(1, 12);
    expect(p[0][1]).toBeCloseTo(0, 12);
    expect(p[1][0]).toBeCloseTo(0, 12);
    expect(p[1][1]).toBeCloseTo(1, 12);
  });
});

describe('det2, transpose2, apply2', () => {
  it('when applied to a known matrix, then they give the textbook values', () => {
    const m: Matrix2 = [
      [1, 2],
      [3, 4],
    ];
    expect(det2(m)).toBe(-2);
    expect(transpose2(m)).toEqual([
      [1, 3],
      [2, 4],
    ]);
    expect(apply2(m, 1, -1)).toEqual([-1, -1]);
  });
});

describe('lowestEigenvalue2', () => {
  it.each([
    // uncoupled: the smaller of k1/m1 and k2/m2
    [4000, 0, 9000, 1, 1, 4000],
    [4000, 0, 9000, 2, 1, 2000],
    // coupled: [[2,1],[1,2]] with unit masses has eigenvalues 1 and 3 (Rao ch. 5 style, from memory)
    [2, 1, 2, 1, 1, 1],
  ])('when K = [[%d, %d], [·, %d]] and M = diag(%d, %d), then the lowest ω² is %d', (k11, k12, k22, m1, m2, expected) => {
    expect(lowestEigenvalue2(k11, k12, k22, m1, m2)).toBeCloseTo(expected, 9);
  });

  it('when the masses differ and the system is coupled, then λ solves det(K − λM) = 0', () => {
    const [k11, k12, k22, m1, m2] = [3e5, -1e5, 5e5, 0.4, 0.9];
    const lam = lowestEigenvalue2(k11, k12, k22, m1, m2);
    expect((k11 - lam * m1) * (k22 - lam * m2) - k12 * k12).toBeCloseTo(0, 0);
    expect(Math.abs((k11 - lam * m1) * (k22 - lam * m2) - k12 * k12) / (k11 * k22)).toBeLessThan(1e-9);
  });
});
