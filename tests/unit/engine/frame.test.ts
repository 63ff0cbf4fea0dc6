import { describe, expect, it } from 'vitest';
import { defaultDesign, frameToTravel, travelToFrame, type Mechanism } from '@/engine';
import { randomDesign, SEEDS } from './helpers/randomDesign';

describe('frameToTravel', () => {
  it('when the crossed-belt template is measured, then X and Y travel follow the flange clearances of its gantry idlers', () => {
    // Derivation (docs/models/belt-layout.md "Travel"): at the right gantry end the smooth idler A1 sits 2R + r in
    // from the right belt line, on the carriage's centre line; the carriage face stops one clearance short of its
    // flange (r + m), so each side loses 2R + 2r + m + c. In Y the gantry idler B5 stacks over the front-right
    // idlers on the same X and must stay 2r + 2m + c away from them; at the back A1 sits beside motor A (R + r
    // apart in X) and may come within √((R + r + 2m + c)² − (R + r)²) in Y of it.
    const d = defaultDesign('corexy');
    const p = d.belt.pitchMm;
    const r = (d.pulley.idlerTeeth * p) / (2 * Math.PI);
    const R = (d.pulley.driveTeeth * p) / (2 * Math.PI);
    const m = 1.25 * p;
    const { outerXMm: W, outerYMm: D, extrusionMm: e, carriageXMm: cx, clearanceMm: c } = d.frame;
    const t = frameToTravel(d);
    expect(t.xMm).toBeCloseTo(W - 2 * e - cx - 2 * (2 * R + 2 * r + m + c), 9);
    const yLo = e + r + r + (2 * r + 2 * m + c);
    const yHi = D - e - R - r - Math.sqrt((R + r + 2 * m + c) ** 2 - (R + r) ** 2);
    expect(t.yMm).toBeCloseTo(yHi - yLo, 9);
    expect(t.sound).toBe(true);
  });

  it('when the cartesian template is measured, then its upright loops give the travel of the belt spans alone', () => {
    // The X loop stands behind the carriage and the Y loops at the frame sides, so only the clamp spans limit X and Y.
    const d = defaultDesign('cartesian');
    const p = d.belt.pitchMm;
    const r = (d.pulley.idlerTeeth * p) / (2 * Math.PI);
    const R = (d.pulley.driveTeeth * p) / (2 * Math.PI);
    const { outerXMm: W, extrusionMm: e, carriageXMm: cx, clearanceMm: c } = d.frame;
    // The clamp spans end where the belt leaves the X idler (r in from the right belt line) and the X motor pulley.
    expect(frameToTravel(d).xMm).toBeCloseTo(W - 2 * e - cx - 2 * c - r - R, 9);
  });

  it.each([
    ['corexy', 'carriage at B1 gantry idler, left end'],
    ['hbot', 'carriage at H8 gantry idler, left end, front'],
    ['cartesian', 'span X.motor – X.clampLeft'],
  ] as const)('when the %s template is measured, then the low X end is limited by %s', (mech, limit) => {
    expect(frameToTravel(defaultDesign(mech)).limitedBy.xLow).toBe(limit);
  });

  it('when the frame grows by 50 mm, then travel grows by 50 mm (limits move one-for-one)', () => {
    const d = defaultDesign('hbot');
    const a = frameToTravel(d);
    const b = frameToTravel({ ...d, frame: { ...d.frame, outerXMm: d.frame.outerXMm + 50, outerYMm: d.frame.outerYMm + 50 } });
    expect(b.xMm - a.xMm).toBeCloseTo(50, 9);
    expect(b.yMm - a.yMm).toBeCloseTo(50, 9);
  });
});

describe('travelToFrame', () => {
  it.each((['corexy', 'hbot', 'cartesian'] as Mechanism[]).flatMap((m) => SEEDS.slice(0, 4).map((s) => [m, s] as const)))(
    'when the travel of a random %s design (seed %i) is asked back, then the frame size is returned',
    (mech, seed) => {
      const d = randomDesign(seed, mech);
      const t = frameToTravel(d);
      const f = travelToFrame({ design: d, travelXMm: t.xMm, travelYMm: t.yMm });
      expect(f.outerXMm).toBeCloseTo(d.frame.outerXMm, 6);
      expect(f.outerYMm).toBeCloseTo(d.frame.outerYMm, 6);
    },
  );

  it('when the wanted travel is negative, then it throws naming travelXMm', () => {
    expect(() => travelToFrame({ design: defaultDesign('corexy'), travelXMm: -1, travelYMm: 100 })).toThrow(/\[travelToFrame\] travelXMm/);
  });
});
