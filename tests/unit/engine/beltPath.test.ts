import { describe, expect, it } from 'vitest';
import { openBeltLengthExactMm, solveBeltPath, wrapAngleRad, type PathElement } from '@/engine';

const pulley = (id: string, xMm: number, radiusMm: number): PathElement => ({ id, xMm, yMm: 0, radiusMm, sense: 1 });

describe('solveBeltPath', () => {
  it('when two equal pulleys 100 mm apart are wrapped, then the spans are straight and each wraps half a turn', () => {
    const r = solveBeltPath([
      { id: 'c1', xMm: 50, yMm: -5, radiusMm: 0, sense: 1 },
      { id: 'p2', xMm: 100, yMm: 0, radiusMm: 5, sense: 1 },
      { id: 'p1', xMm: 0, yMm: 0, radiusMm: 5, sense: 1 },
      { id: 'c2', xMm: 40, yMm: -5, radiusMm: 0, sense: 1 },
    ]);
    expect(r.valid).toBe(true);
    expect(r.spans.map((s) => s.lengthMm)).toEqual([50, 100, 40].map((v) => expect.closeTo(v, 9)));
    expect(r.wraps.map((w) => w.wrapRad)).toEqual([Math.PI, Math.PI].map((v) => expect.closeTo(v, 12)));
    expect(r.lengthMm).toBeCloseTo(190 + 10 * Math.PI, 9);
  });

  it.each([
    [150, (20 * 2) / Math.PI / 2, (60 * 2) / Math.PI / 2],
    [80, 6, 15],
  ])(
    'when an open drive C = %d mm is solved, then wraps and length match the closed forms (Britannica 1911, Shigley ch. 17)',
    (c, r1, r2) => {
      // Arrange: small → big → small gives both spans and the big wrap; big → small → big gives the small wrap.
      const there = solveBeltPath([pulley('p1', 0, r1), pulley('p2', c, r2), pulley('p1', 0, r1)]);
      const back = solveBeltPath([pulley('p2', c, r2), pulley('p1', 0, r1), pulley('p2', c, r2)]);
      // Act
      const big = there.wraps[0].wrapRad;
      const small = back.wraps[0].wrapRad;
      const length = there.spans[0].lengthMm + there.spans[1].lengthMm + there.wraps[0].arcMm + back.wraps[0].arcMm;
      // Assert
      expect(small).toBeCloseTo(wrapAngleRad({ centerMm: c, d1Mm: 2 * r1, d2Mm: 2 * r2 }), 9);
      expect(big).toBeCloseTo(2 * Math.PI - small, 9);
      expect(length).toBeCloseTo(openBeltLengthExactMm({ centerMm: c, d1Mm: 2 * r1, d2Mm: 2 * r2 }), 6);
    },
  );

  it('when a span runs round a pulley clockwise, then the tangent point sits on the other side', () => {
    const r = solveBeltPath([
      { id: 'a', xMm: 0, yMm: 0, radiusMm: 0, sense: 1 },
      { id: 'p', xMm: 100, yMm: -10, radiusMm: 10, sense: -1 },
      { id: 'b', xMm: 110, yMm: -100, radiusMm: 0, sense: 1 },
    ]);
    expect(r.spans[0].y2Mm).toBeCloseTo(0, 9);
    expect(r.spans[1].x1Mm).toBeCloseTo(110, 9);
    expect(r.wraps[0].wrapRad).toBeCloseTo(Math.PI / 2, 9);
  });

  it('when two pulleys overlap, then the path is marked invalid', () => {
    const r = solveBeltPath([
      { id: 'p', xMm: 0, yMm: 0, radiusMm: 10, sense: 1 },
      { id: 'q', xMm: 5, yMm: 0, radiusMm: 10, sense: -1 },
    ]);
    expect(r.valid).toBe(false);
  });
});
