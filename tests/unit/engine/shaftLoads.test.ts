import { describe, expect, it } from 'vitest';
import { pulleyRadialLoadN, shaftLoads, solveBeltPath } from '@/engine';

describe('pulleyRadialLoadN', () => {
  it.each([
    // derived: equal pulls T at wrap θ give 2·T·sin(θ/2)
    [40, Math.PI, 80],
    [40, Math.PI / 2, 2 * 40 * Math.sin(Math.PI / 4)],
    [25, Math.PI / 3, 25],
  ])('when both arms pull %d N over a %d rad wrap, then the shaft takes 2·T·sin(θ/2) = %d N', (t, wrapRad, expected) => {
    expect(pulleyRadialLoadN({ tension1N: t, tension2N: t, wrapRad })).toBeCloseTo(expected, 10);
  });

  it('when the arms pull unequally, then the load is the vector sum of the two tangent pulls (independent: belt-path geometry)', () => {
    // Arrange: a belt from a clamp at the left, over the top of a 20-tooth pulley at the origin and down to a
    // clamp below-right; the solved path gives the tangent points, hence each arm's direction
    const r = 6.366;
    const path = solveBeltPath([
      { id: 'a', xMm: -100, yMm: r, radiusMm: 0, sense: 1 },
      { id: 'p', xMm: 0, yMm: 0, radiusMm: r, sense: -1 },
      { id: 'b', xMm: 60, yMm: -80, radiusMm: 0, sense: 1 },
    ]);
    const [s1, s2] = path.spans;
    const u1 = [s1.x1Mm - s1.x2Mm, s1.y1Mm - s1.y2Mm].map((v) => v / s1.lengthMm);
    const u2 = [s2.x2Mm - s2.x1Mm, s2.y2Mm - s2.y1Mm].map((v) => v / s2.lengthMm);
    const t1 = 55;
    const t2 = 18;
    const vec = [t1 * u1[0] + t2 * u2[0], t1 * u1[1] + t2 * u2[1]];
    // Act
    const load = pulleyRadialLoadN({ tension1N: t1, tension2N: t2, wrapRad: path.wraps[0].wrapRad });
    // Assert
    expect(load).toBeCloseTo(Math.hypot(vec[0], vec[1]), 9);
  });

  it('when one arm has gone slack (negative), then it pushes nothing', () => {
    expect(pulleyRadialLoadN({ tension1N: 30, tension2N: -5, wrapRad: Math.PI })).toBeCloseTo(30, 12);
  });
});

describe('shaftLoads', () => {
  it('when a drive pulley and an idler are loaded, then the largest of each kind and their ratings are reported', () => {
    // Act
    const r = shaftLoads({
      pulleys: [
        { id: 'A.motor', label: 'motor A pulley', kind: 'drive', wrapRad: Math.PI / 2, atPretensionN: [40, 40], atPeakN: [70, 30] },
        { id: 'A.idler', label: 'idler', kind: 'idler', wrapRad: Math.PI, atPretensionN: [40, 40], atPeakN: [70, 70] },
      ],
      motorShaftRatingN: 28,
      idlerRatingN: 200,
    });
    // Assert
    expect(r.motorShaftRadialN.atPretension).toBeCloseTo(80 * Math.sin(Math.PI / 4), 10);
    expect(r.motorShaftRadialN.atPeak).toBeCloseTo(Math.hypot(70, 30), 10);
    expect(r.idlerRadialN).toEqual({ atPretension: 80, atPeak: 140 });
    expect(r.ratingN).toEqual({ motorShaft: 28, idler: 200 });
    expect(r.pulleys[0].wrapDeg).toBeCloseTo(90, 10);
  });
});
