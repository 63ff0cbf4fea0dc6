import { describe, expect, it } from 'vitest';
import { defaultDesign, frameToTravel, travelToFrame, type Mechanism } from '@/engine';
import { randomDesign, SEEDS } from './helpers/randomDesign';

describe('frameToTravel', () => {
  it('when the crossed-belt template is measured, then X travel = W − 2e − cx − 2c − 6·r_idler and Y travel = D − 2e − 2c − depth', () => {
    // Derivation: the left gantry idler of belt A sits 3 idler radii in from the left belt line (front-left
    // idler's return run at 2r plus its own radius) and the belt leaves it at its centre line; the carriage
    // clamp must stay one clearance away. Belt B mirrors it on the right. In Y the gantry body (the deeper of
    // beam and carriage) limits first.
    const d = defaultDesign('corexy');
    const rI = (d.pulley.idlerTeeth * d.belt.pitchMm) / (2 * Math.PI);
    const t = frameToTravel(d);
    expect(t.xMm).toBeCloseTo(d.frame.outerXMm - 2 * d.frame.extrusionMm - d.frame.carriageXMm - 2 * d.frame.clearanceMm - 6 * rI, 9);
    expect(t.yMm).toBeCloseTo(
      d.frame.outerYMm - 2 * d.frame.extrusionMm - 2 * d.frame.clearanceMm - Math.max(d.frame.carriageYMm, d.frame.gantryYMm),
      9,
    );
    expect(t.sound).toBe(true);
  });

  it.each([
    ['corexy', 'span A.gantryLeft – A.clampLeft'],
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
