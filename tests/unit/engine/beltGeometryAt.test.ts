import { describe, expect, it } from 'vitest';
import { EngineInputError, beltGeometryAt, defaultDesign, evaluateDesign } from '@/engine';

describe('beltGeometryAt', () => {
  it('when asked at the parking position, then it repeats the spans and arms of the evaluation', () => {
    const d = defaultDesign('corexy');
    const r = evaluateDesign(d);
    const g = beltGeometryAt({ design: d, xMm: r.parking.xMm, yMm: r.parking.yMm });
    g.forEach((b, i) => {
      expect(b.loopLengthMm).toBeCloseTo(r.belts[i].loopLengthMm, 9);
      expect(b.arms.map((a) => a.lengthMm)).toEqual(r.belts[i].arms.map((a) => expect.closeTo(a.lengthMm, 9)));
      expect(b.spans.map((s) => s.lengthMm)).toEqual(r.belts[i].spans.map((s) => expect.closeTo(s.lengthMm, 9)));
    });
  });

  it.each([
    [0, 0],
    [1, 0],
    [0, 1],
  ])("when a crossed-belt carriage moves from the origin by (%i, %i) × 10 mm, then belt A's short arm shortens by ΔX + ΔY", (fx, fy) => {
    // ΔA = ΔX + ΔY (CoreXY 2012): the arm from the right clamp round to motor A is what motor A reels in.
    const d = defaultDesign('corexy');
    const a0 = beltGeometryAt({ design: d, xMm: 0, yMm: 0 })[0].arms[0].lengthMm;
    const a1 = beltGeometryAt({ design: d, xMm: 10 * fx, yMm: 10 * fy })[0].arms[0].lengthMm;
    expect(a0 - a1).toBeCloseTo(10 * fx + 10 * fy, 9);
  });

  it('when the position is outside the travel, then it throws naming xMm', () => {
    expect(() => beltGeometryAt({ design: defaultDesign('hbot'), xMm: 5000, yMm: 0 })).toThrow(EngineInputError);
    expect(() => beltGeometryAt({ design: defaultDesign('hbot'), xMm: 5000, yMm: 0 })).toThrow(/\[beltGeometryAt\] xMm/);
  });
});
