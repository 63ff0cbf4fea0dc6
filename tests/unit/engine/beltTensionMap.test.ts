import { describe, expect, it } from 'vitest';
import {
  beltTensionOverTravel,
  convexHullIndices,
  defaultDesign,
  evaluateDesign,
  frameToTravel,
  kinematicsMatrix,
  parseDesign,
  solveLoop,
  type DesignInput,
  type PullPairs,
} from '@/engine';
import { springChainN } from './helpers/springChain';

/** Pull pairs that are not symmetric and not on a box, so the hull has many vertices. */
function syntheticPairs(count: number, seed: number): PullPairs {
  let x = seed;
  const r = () => ((x = (x * 16807) % 2147483647) / 2147483647) * 2 - 1;
  const aN = new Float64Array(count);
  const bN = new Float64Array(count);
  const directionDeg = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    aN[i] = 30 * r() + 4;
    bN[i] = 22 * r() - 3;
    directionDeg[i] = i % 360;
  }
  return { aN, bN, directionDeg };
}

/**
 * Brute force at one carriage position, differently built from the engine: piece lengths from solveLoop (the
 * belt path itself, not the affine model), each pulley's belt flow from a finite difference of those lengths, its
 * share of the coordinate's pull from the number of pulleys on that coordinate, every pull pair (no hull), and the
 * piece tensions from the spring-network solve.
 */
function bruteForceAt(d: DesignInput, pairs: PullPairs, xMm: number, yMm: number): { loopId: string; tight: number; slack: number }[] {
  const t = frameToTravel(d);
  const k = kinematicsMatrix(d.mechanism, d.motorDirection);
  const cx = t.originXMm + xMm;
  const cy = t.originYMm + yMm;
  const perCoord = [0, 0];
  const coordOf = (v: string) => t.layout.motorVars.find((m) => m.id === v)!.coordinate;
  for (const loop of t.layout.loops) for (const e of loop.elements) if (e.kind === 'drive') perCoord[coordOf(e.motor!)] += 1;
  return t.layout.loops.map((loop) => {
    const st = solveLoop(loop, cx, cy);
    const h = 1e-3;
    const sx = solveLoop(loop, cx + h, cy);
    const sy = solveLoop(loop, cx, cy + h);
    const lengths = st.pieces.map((p) => p.lengthMm);
    // flow through pulley j per unit move = −Σ_{i≤j} ∂Lᵢ/∂q; its sign against K's row of the pulley's coordinate
    const shares = st.nodeMotors.map((v, j) => {
      let fx = 0;
      let fy = 0;
      for (let i = 0; i <= j; i++) {
        fx -= (sx.pieces[i].lengthMm - st.pieces[i].lengthMm) / h;
        fy -= (sy.pieces[i].lengthMm - st.pieces[i].lengthMm) / h;
      }
      const c = coordOf(v);
      return { c, share: Math.sign(fx * k[c][0] + fy * k[c][1]) / perCoord[c] };
    });
    let tight = -Infinity;
    let slack = Infinity;
    for (let i = 0; i < pairs.aN.length; i++) {
      const pulls = shares.map((s) => s.share * (s.c === 0 ? pairs.aN[i] : pairs.bN[i]));
      for (const dT of springChainN(lengths, pulls, d.belt.axialStiffnessN)) {
        tight = Math.max(tight, d.pretensionN + dT);
        slack = Math.min(slack, d.pretensionN + dT);
      }
    }
    return { loopId: loop.id, tight, slack };
  });
}

describe('convexHullIndices', () => {
  it('when points fill a square with its corners, then the hull is the four corners', () => {
    // Arrange
    const xs = [0, 1, 1, 0, 0.5, 0.2, 0.9];
    const ys = [0, 0, 1, 1, 0.5, 0.7, 0.1];
    // Act
    const hull = convexHullIndices(xs, ys).sort();
    // Assert
    expect(hull).toEqual([0, 1, 2, 3]);
  });
});

describe('beltTensionOverTravel', () => {
  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when a %s design carries arbitrary pulls, then the map equals a brute force over every pull at sample points (independent)',
    (mechanism) => {
      // Arrange
      const d = parseDesign({ ...defaultDesign(mechanism), yMotors: mechanism === 'cartesian' ? 2 : 1, map: { points: 5 } });
      const t = frameToTravel(d);
      const pairs = syntheticPairs(400, 7);
      const xs = [0, t.xMm / 4, t.xMm / 2, (3 * t.xMm) / 4, t.xMm];
      const ys = [0, t.yMm / 4, t.yMm / 2, (3 * t.yMm) / 4, t.yMm];
      // Act
      const res = beltTensionOverTravel({
        models: t.models,
        motorVars: t.layout.motorVars,
        k: kinematicsMatrix(d.mechanism, d.motorDirection),
        pretensionN: d.pretensionN,
        pairs,
        originXMm: t.originXMm,
        originYMm: t.originYMm,
        xMm: xs,
        yMm: ys,
      });
      // Assert
      for (const [ix, iy] of [
        [0, 0],
        [4, 4],
        [0, 4],
        [2, 1],
        [4, 0],
      ]) {
        const brute = bruteForceAt(d, pairs, xs[ix], ys[iy]);
        brute.forEach((b, i) => {
          expect(res[i].loopId).toBe(b.loopId);
          expect(res[i].tightMapN[iy][ix]).toBeCloseTo(b.tight, 2);
          expect(res[i].slackMapN[iy][ix]).toBeCloseTo(b.slack, 2);
        });
      }
    },
  );
});

describe('evaluateDesign belt tension', () => {
  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when a %s stage is pretensioned to 0.6 × its peak pull, then the slack check fails (the short arm takes almost all the pull)',
    (mechanism) => {
      // Arrange
      const d = defaultDesign(mechanism);
      const peak = Math.max(...evaluateDesign(d).belts.map((b) => b.tension.peakPullN));
      // Act
      const r = evaluateDesign({ ...d, pretensionN: 0.6 * peak });
      // Assert
      const slack = r.checks.filter((c) => c.id === 'belt-slack');
      expect(slack.length).toBe(r.belts.length);
      expect(slack.some((c) => c.severity === 'fail')).toBe(true);
      expect(Math.min(...r.belts.map((b) => b.tension.worstSlackN))).toBeLessThanOrEqual(0);
    },
  );

  it('when a crossed-belt stage is evaluated, then its worst slack side sits at an end of the travel, not at the centre', () => {
    // Arrange
    const d = defaultDesign('corexy');
    // Act
    const r = evaluateDesign(d);
    // Assert
    for (const b of r.belts) {
      const at = b.tension.worstSlackAt;
      const atEnd = at.xMm === 0 || at.yMm === 0 || Math.abs(at.xMm - r.travel.xMm) < 1e-9 || Math.abs(at.yMm - r.travel.yMm) < 1e-9;
      expect(atEnd).toBe(true);
      const n = r.stiffness.xMm.length;
      const centre = b.tension.slackMapN[(n - 1) / 2][(n - 1) / 2];
      expect(b.tension.worstSlackN).toBeLessThan(centre);
    }
  });

  it('when the tensile allowable is reported, then it is the typed value, not derated', () => {
    // Arrange
    const d = defaultDesign('corexy');
    // Act
    const r = evaluateDesign({ ...d, belt: { ...d.belt, allowableTensionN: 123 }, pulley: { ...d.pulley, driveTeeth: 10 } });
    // Assert: a 10-tooth drive pulley has under 6 teeth in mesh, which derates the tooth load, never the cords
    expect(r.belts[0].teethInMesh).toBeLessThan(6);
    for (const b of r.belts) {
      expect(b.tension.tensileAllowableN).toBe(123);
      expect(b.tension.countedTeeth).toBeLessThan(6);
    }
  });
});
