import { describe, expect, it } from 'vitest';
import {
  buildBeltLayout,
  defaultDesign,
  evaluateDesign,
  fitLoopModel,
  frameToTravel,
  kinematicsMatrix,
  solveLoop,
  type Mechanism,
} from '@/engine';
import { randomDesign, SEEDS } from './helpers/randomDesign';

const MECHS: Mechanism[] = ['corexy', 'hbot', 'cartesian'];
const CASES = MECHS.flatMap((m) => SEEDS.slice(0, 6).map((s) => [m, s] as const));

/**
 * Belt each motor pulley must pass on for a carriage move q so that no piece stretches: piece i lies between
 * motor i−1 and motor i, and stretch Gᵢ·q − m₍ᵢ₋₁₎ + mᵢ = 0 gives mᵢ = m₍ᵢ₋₁₎ − Gᵢ·q.
 */
function transfers(pieces: { gx: number; gy: number }[], qx: number, qy: number): { motors: number[]; closure: number } {
  const m: number[] = [];
  let prev = 0;
  for (let i = 0; i < pieces.length - 1; i++) {
    prev = prev - (pieces[i].gx * qx + pieces[i].gy * qy);
    m.push(prev);
  }
  const last = pieces[pieces.length - 1];
  return { motors: m, closure: last.gx * qx + last.gy * qy - prev };
}

describe('buildBeltLayout', () => {
  it.each(CASES)('when a random %s design (seed %i) moves over its travel, then every belt keeps its length', (mech, seed) => {
    // Arrange
    const d = randomDesign(seed, mech);
    const t = frameToTravel(d);
    const corners = [
      [0, 0],
      [t.xMm, 0],
      [0, t.yMm],
      [t.xMm, t.yMm],
      [t.xMm * 0.3, t.yMm * 0.8],
    ];
    for (const loop of t.layout.loops) {
      // Act
      const lengths = corners.map(([x, y]) => solveLoop(loop, t.originXMm + x, t.originYMm + y).path.lengthMm);
      // Assert
      for (const l of lengths) expect(l).toBeCloseTo(lengths[0], 6);
    }
  });

  it.each(CASES)(
    'when a random %s design (seed %i) is moved, then the motor belt follows the K matrix of docs/models/envelope.md §1',
    (mech, seed) => {
      const d = randomDesign(seed, mech);
      const t = frameToTravel(d);
      const k = kinematicsMatrix(mech);
      const motorVars = t.layout.motorVars;
      for (const model of t.models) {
        for (const [qx, qy] of [
          [1, 0],
          [0, 1],
          [0.3, -0.7],
        ]) {
          const { motors, closure } = transfers(model.pieces, qx, qy);
          expect(closure).toBeCloseTo(0, 9);
          motors.forEach((m, i) => {
            const coord = motorVars.find((v) => v.id === model.nodeMotors[i])!.coordinate;
            const expected = k[coord][0] * qx + k[coord][1] * qy;
            // The layout fixes each motor's sense only up to sign; the sign convention lives in K.
            expect(Math.abs(m)).toBeCloseTo(Math.abs(expected), 9);
          });
        }
      }
    },
  );

  it.each(MECHS)('when the %s layout is solved at mid-frame, then every wrap is the quarter or half turn it is drawn for', (mech) => {
    const d = randomDesign(99, mech);
    const t = frameToTravel(d);
    for (const loop of t.layout.loops) {
      const st = solveLoop(loop, t.originXMm + t.xMm / 2, t.originYMm + t.yMm / 2);
      expect(st.sound).toBe(true);
      loop.elements.slice(1, -1).forEach((e, j) => {
        // Unequal drive and idler sizes tilt the return runs slightly: allow a few degrees.
        expect(Math.abs(st.path.wraps[j].wrapRad - (e.expectedWrapRad ?? 0))).toBeLessThan(0.1);
      });
    }
  });

  it.each(MECHS)('when the %s piece lengths are fitted, then the affine model is exact at the far corner', (mech) => {
    const d = randomDesign(5, mech);
    const t = frameToTravel(d);
    t.layout.loops.forEach((loop) => {
      const { model } = fitLoopModel(loop, d.frame.outerXMm / 2, d.frame.outerYMm / 2);
      const x = t.originXMm + t.xMm;
      const y = t.originYMm;
      const st = solveLoop(loop, x, y);
      st.pieces.forEach((pc, i) => {
        const p = model.pieces[i];
        expect(p.l0Mm + p.gx * x + p.gy * y).toBeCloseTo(pc.lengthMm, 6);
      });
    });
  });

  it.each([
    ['corexy', ['frame', 'frame'], 'motors sit on the frame'],
    ['hbot', ['frame', 'frame'], 'motors sit on the frame'],
    ['cartesian', ['gantry', 'frame', 'frame'], 'the X motor rides the gantry'],
  ] as const)('when the %s layout is built, then the drive pulleys ride %j (%s)', (mech, bodies, _why) => {
    const layout = buildBeltLayout(randomDesign(3, mech));
    const drives = layout.loops.flatMap((l) => l.elements.filter((e) => e.kind === 'drive').map((e) => e.body));
    expect(drives).toEqual(bodies);
  });

  it('when the crossed-belt layout is built, then belt B is the mirror image of belt A', () => {
    const d = randomDesign(11, 'corexy');
    const layout = buildBeltLayout(d);
    const [a, b] = layout.loops;
    a.elements.forEach((ea, i) => {
      const eb = b.elements[i];
      expect(eb.body).toBe(ea.body);
      expect(eb.sense).toBe(-ea.sense);
      expect(eb.baseYMm).toBeCloseTo(ea.baseYMm, 12);
      expect(eb.baseXMm).toBeCloseTo(ea.body === 'carriage' ? -ea.baseXMm : d.frame.outerXMm - ea.baseXMm, 12);
    });
  });

  it.each([
    ['corexy', { A: 1, B: 2 }],
    ['hbot', { H: 1 }],
    ['cartesian', { X: 2, YL: 1, YR: 1 }],
  ] as const)('when the %s layout is built, then each belt and all its elements sit on the level %j', (mech, levels) => {
    const layout = buildBeltLayout(randomDesign(7, mech));
    expect(Object.fromEntries(layout.loops.map((l) => [l.id, l.level]))).toEqual(levels);
    for (const l of layout.loops) for (const e of l.elements) expect(e.level).toBe(l.level);
  });

  it('when the crossed-belt layout is solved, then each motor pulley takes half a turn (twice the old quarter-turn wrap)', () => {
    // The old layout turned each belt a quarter turn at its motor, so a 20-tooth pulley had 5 teeth in mesh; each
    // motor now sits alone in its back corner and the belt goes round it and back: 10 teeth in mesh.
    const r = evaluateDesign(defaultDesign('corexy'));
    for (const b of r.belts) {
      expect(b.driveWrapDeg).toBeCloseTo(180, 6);
      expect(b.teethInMesh).toBeCloseTo(10, 6);
    }
  });

  it('when the crossed-belt layout is built, then only idler pairs share a centre, on one stack id, one per level', () => {
    const layout = buildBeltLayout(randomDesign(21, 'corexy'));
    const els = layout.loops.flatMap((l) => l.elements.filter((e) => e.kind !== 'clamp'));
    const frame = els.filter((e) => e.body === 'frame');
    const pairs = frame.flatMap((e, i) =>
      frame
        .slice(i + 1)
        .filter((f) => Math.hypot(e.baseXMm - f.baseXMm, e.baseYMm - f.baseYMm) < 1e-9)
        .map((f) => [e, f]),
    );
    expect(pairs.map(([e, f]) => `${e.tag}+${f.tag}`).sort()).toEqual(['A3+B4', 'A4+B3']);
    for (const [e, f] of pairs) {
      expect([e.kind, f.kind]).toEqual(['idler', 'idler']);
      expect(e.stackId).toBe(f.stackId);
      expect(e.level).not.toBe(f.level);
    }
  });

  it('when the H layout is solved anywhere in the travel, then the passing run lies behind the carriage', () => {
    const d = randomDesign(33, 'hbot');
    const t = frameToTravel(d);
    const loop = t.layout.loops[0];
    for (const [fx, fy] of [
      [0, 0],
      [1, 1],
      [0.5, 0.2],
    ]) {
      const cy = t.originYMm + fy * t.yMm;
      const st = solveLoop(loop, t.originXMm + fx * t.xMm, cy);
      const passing = st.path.spans.find((s) => s.from === 'H.gantryRightBack')!;
      expect(passing.to).toBe('H.gantryLeftBack');
      expect(Math.min(passing.y1Mm, passing.y2Mm)).toBeGreaterThan(cy + d.frame.carriageYMm / 2);
    }
  });

  it('when every element is listed, then its label starts with its tag and tags are unique', () => {
    for (const mech of ['corexy', 'hbot', 'cartesian'] as const) {
      const els = buildBeltLayout(defaultDesign(mech)).loops.flatMap((l) => l.elements.filter((e) => e.kind !== 'clamp'));
      for (const e of els) expect(e.label.startsWith(`${e.tag} `)).toBe(true);
      expect(new Set(els.map((e) => e.tag)).size).toBe(els.length);
    }
  });
});
