import { describe, expect, it } from 'vitest';
import {
  defaultDesign,
  evaluateDesign,
  frameToTravel,
  guideReactionN,
  rackingMomentPerNewtonM,
  rackingTurnSpacingMm,
  solveLoop,
  type Mechanism,
} from '@/engine';
import { prng } from './helpers/randomDesign';

/**
 * Independent free body of the gantry from the solved belt geometry: every span that ends on a gantry-riding
 * element pulls it toward the span's other end with its piece's tension. Returns the moment about the frame's
 * vertical centre line and the X force on the carriage clamps, for given tensions per piece.
 */
function freeBody(mech: Mechanism, tensions: (loopIndex: number, pieceIndex: number) => number): { momentNm: number; forceXN: number } {
  const d = defaultDesign(mech);
  const t = frameToTravel(d);
  const cx = t.originXMm + 0.37 * t.xMm;
  const cy = t.originYMm + 0.61 * t.yMm;
  let m = 0;
  let fx = 0;
  t.layout.loops.forEach((loop, li) => {
    const st = solveLoop(loop, cx, cy);
    let piece = 0;
    st.path.spans.forEach((s, si) => {
      const tension = tensions(li, piece);
      const from = loop.elements[si];
      const to = loop.elements[si + 1];
      const ux = (s.x2Mm - s.x1Mm) / s.lengthMm;
      const uy = (s.y2Mm - s.y1Mm) / s.lengthMm;
      // The span pulls its start toward its end and its end toward its start.
      for (const [el, px, py, sign] of [
        [from, s.x1Mm, s.y1Mm, 1],
        [to, s.x2Mm, s.y2Mm, -1],
      ] as const) {
        if (el.body === 'frame') continue;
        const fX = sign * tension * ux;
        const fY = sign * tension * uy;
        m += ((px - d.frame.outerXMm / 2) * fY - (py - cy) * fX) / 1000;
        if (el.kind === 'clamp' && el.body === 'carriage') fx += fX;
      }
      if (to.kind === 'drive') piece++;
    });
  });
  return { momentNm: m, forceXN: fx };
}

describe('rackingMomentPerNewtonM', () => {
  it.each([
    ['hbot', 0.5],
    ['corexy', 0],
    ['cartesian', 0],
  ] as const)(
    'when the mechanism is %s, then the moment per newton is %d × S (docs/models/racking.md: M = Fx·S/2 for the H layout)',
    (mechanism, factor) => {
      expect(rackingMomentPerNewtonM({ mechanism, turnSpacingMm: 400 })).toBeCloseTo((factor * 400) / 1000, 12);
    },
  );

  it('when the H-belt gantry is cut free with random piece tensions, then the moment is Fx·S/2', () => {
    const r = prng(42);
    const d = defaultDesign('hbot');
    const s = rackingTurnSpacingMm(frameToTravel(d).layout);
    for (let i = 0; i < 5; i++) {
      const t = [20 + 40 * r(), 20 + 40 * r(), 20 + 40 * r()];
      const fb = freeBody('hbot', (_l, p) => t[p]);
      expect(Math.abs(fb.forceXN)).toBeCloseTo(Math.abs(t[0] - t[2]), 9);
      expect(Math.abs(fb.momentNm)).toBeCloseTo((Math.abs(fb.forceXN) * s) / 2 / 1000, 9);
    }
  });

  it('when the crossed-belt gantry is cut free under an X pull (both loops ±F/2 about the pretension), then the moments cancel', () => {
    // An X force needs equal pulls of both motors (Fx = FA + FB, Fy = FA − FB = 0). A Y pull would leave
    // r_idler·Fy because each return run sits one idler diameter inboard; the engine neglects that (README).
    const r = prng(7);
    for (let i = 0; i < 5; i++) {
      const pull = 30 * r();
      const fb = freeBody('corexy', (_l, p) => 40 + (p === 0 ? 1 : -1) * (pull / 2));
      expect(fb.momentNm).toBeCloseTo(0, 9);
      expect(Math.abs(fb.forceXN)).toBeGreaterThan(0);
    }
  });
});

describe('rackingTurnSpacingMm', () => {
  it('when the H template is measured, then S = W − 2e − 4·r_idler (the front gantry idlers sit 2r in from the side runs)', () => {
    const d = defaultDesign('hbot');
    const rI = (d.pulley.idlerTeeth * d.belt.pitchMm) / (2 * Math.PI);
    expect(rackingTurnSpacingMm(frameToTravel(d).layout)).toBeCloseTo(d.frame.outerXMm - 2 * d.frame.extrusionMm - 4 * rI, 9);
    expect(rackingTurnSpacingMm(frameToTravel(defaultDesign('corexy')).layout)).toBe(0);
  });
});

describe('guideReactionN', () => {
  it.each([
    [2, 40, 50],
    [-3, 60, 50],
  ])('when a %d N·m moment is held over %d mm, then each guide contact takes %d N', (momentNm, guideSpanMm, expected) => {
    expect(guideReactionN({ momentNm, guideSpanMm })).toBeCloseTo(expected, 9);
  });

  it('when the H template is evaluated, then the reported reaction is the peak moment over the gantry depth', () => {
    const r = evaluateDesign(defaultDesign('hbot')).racking;
    expect(r.peakMomentNm).toBeCloseTo(r.momentPerNewtonM * r.peakForceXN, 12);
    expect(r.guideReactionN).toBeCloseTo(r.peakMomentNm / (r.guideSpanMm / 1000), 9);
    expect(evaluateDesign(defaultDesign('corexy')).racking.guideReactionN).toBe(0);
  });
});
