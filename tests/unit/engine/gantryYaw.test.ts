import { eigs, inv, lusolve, multiply } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  defaultDesign,
  frameToTravel,
  gantryYawMap,
  gantryYawMass,
  motorHoldingStiffnessNmPerRad,
  solveLoop,
  stiffnessMap,
  yawSlopesMmPerRad,
  type BeltLayout,
  type Mechanism,
  type StiffnessInput,
} from '@/engine';

function setup(mech: Mechanism, yMotors: 1 | 2 = 1, points = 5) {
  const d = { ...defaultDesign(mech), yMotors };
  const t = frameToTravel(d);
  const slopes = yawSlopesMmPerRad(t.layout, t.originXMm + t.xMm / 2, t.originYMm + t.yMm / 2);
  const r = (d.pulley.driveTeeth * d.belt.pitchMm) / (2 * Math.PI) / 1000;
  const km = motorHoldingStiffnessNmPerRad(d.motor, d.driver) / (r * r);
  const inp: StiffnessInput = {
    models: t.models,
    motorStiffnessNPerM: { A: km, B: km, B2: km },
    axialStiffnessN: d.belt.axialStiffnessN,
    xKg: 0.4,
    yKg: 0.85,
    originXMm: t.originXMm,
    originYMm: t.originYMm,
    travelXMm: t.xMm,
    travelYMm: t.yMm,
    points,
    yawSlopesMmPerRad: slopes,
  };
  return { d, t, slopes, inp };
}

/** Every piece length of a layout with the gantry (and carriage) turned by φ and the carriage moved by dx. */
function pieceLengths(layout: BeltLayout, cx: number, cy: number, phi: number, dx: number): number[] {
  const xm = layout.outerXMm / 2;
  return layout.loops.flatMap((loop) => {
    const moved = {
      ...loop,
      elements: loop.elements.map((e) => {
        if (e.body === 'frame') return e;
        const x = e.body === 'gantry' ? e.baseXMm - xm : e.baseXMm + cx + dx - xm;
        return { ...e, baseXMm: e.baseXMm - phi * e.baseYMm, baseYMm: e.baseYMm + phi * x };
      }),
    };
    return solveLoop(moved, cx + dx, cy).pieces.map((p) => p.lengthMm);
  });
}

describe('yawSlopesMmPerRad', () => {
  it('when a cartesian gantry turns, then each Y belt piece changes by its gantry end’s Y travel (derived: ±(distance from mid-span)·φ, within 1 %)', () => {
    // Arrange
    const { t, slopes } = setup('cartesian');
    const leftEnd = t.layout.loops[1].elements.find((e) => e.id === 'YL.clampFront')!.baseXMm - t.layout.outerXMm / 2;
    // Act / Assert: belt X rides the gantry and does not change; the left belt's front piece follows the left end
    expect(slopes[0]).toEqual([0, 0]);
    expect(slopes[1][1]).toBeCloseTo(leftEnd, 6);
    expect(Math.abs(slopes[1][0] / -leftEnd - 1)).toBeLessThan(0.01);
    expect(slopes[2][1]).toBeCloseTo(-leftEnd, 6);
  });

  it('when an H-belt gantry turns by φ while the carriage slides (S/2)·φ along X, then no belt piece changes length (independent: belt path re-solved)', () => {
    // Arrange: the slopes say piece 1 grows by gφ·φ and shrinks by dx; so dx = gφ·φ should leave it unchanged
    const { t, slopes } = setup('hbot');
    const cx = t.originXMm + 0.3 * t.xMm;
    const cy = t.originYMm + 0.6 * t.yMm;
    const phi = 1e-3;
    // Act
    const before = pieceLengths(t.layout, cx, cy, 0, 0);
    const residual = (p: number) => {
      const after = pieceLengths(t.layout, cx, cy, p, slopes[0][0] * p);
      return Math.max(...after.map((l, i) => Math.abs(l - before[i])));
    };
    const turnedOnly = pieceLengths(t.layout, cx, cy, phi, 0);
    // Assert: the H loop has a mechanism the guides alone must hold: without the slide the turn stretches the belt
    // to first order; with it what is left is second order in φ (a quarter when φ halves)
    const stretch = Math.max(...turnedOnly.map((l, i) => Math.abs(l - before[i])));
    expect(stretch).toBeGreaterThan(0.1);
    expect(residual(phi)).toBeLessThan(5e-3 * stretch);
    expect(residual(phi / 2) / residual(phi)).toBeCloseTo(0.25, 1);
  });
});

describe('gantryYawMap', () => {
  it('when the H-belt stage is mapped, then the belts leave yaw unheld everywhere (0 Hz)', () => {
    const { inp, d, t } = setup('hbot');
    const map = stiffnessMap(inp);
    const span = d.frame.outerXMm - 2 * d.frame.extrusionMm;
    const yaw = gantryYawMap({
      kNPerM: map.kNPerM,
      yawAt: map.yawAt!,
      nx: map.xMm.length,
      ny: map.yMm.length,
      halfSpanMm: span / 2,
      massAt: (ix) =>
        gantryYawMass({
          xKg: 0.4,
          gantryKg: 0.45,
          spanMm: span,
          points: [{ massKg: 0.4, offsetMm: t.originXMm + map.xMm[ix] - d.frame.outerXMm / 2 }],
        }),
    });
    yaw.flat().forEach((f) => expect(f).toBe(0));
  });

  it.each([
    ['corexy', 1],
    ['cartesian', 2],
    ['cartesian', 1],
  ] as const)(
    'when a %s stage (%d Y motors) is mapped, then each point is the mathjs eigenvalue whose mode turns the gantry (library)',
    (mech, yMotors) => {
      // Arrange
      const { inp, d, t } = setup(mech, yMotors, 3);
      const map = stiffnessMap(inp);
      const span = d.frame.outerXMm - 2 * d.frame.extrusionMm;
      const massAt = (ix: number) =>
        gantryYawMass({
          xKg: 0.4,
          gantryKg: 0.45,
          spanMm: span,
          points: [{ massKg: 0.4, offsetMm: t.originXMm + map.xMm[ix] - d.frame.outerXMm / 2 }],
        });
      // Act
      const yaw = gantryYawMap({ kNPerM: map.kNPerM, yawAt: map.yawAt!, nx: 3, ny: 3, halfSpanMm: span / 2, massAt });
      // Assert
      for (let iy = 0; iy < 3; iy++)
        for (let ix = 0; ix < 3; ix++) {
          const p = iy * 3 + ix;
          const m = massAt(ix);
          const y = map.yawAt!(ix, iy);
          const K = [
            [map.kNPerM.xx[p], map.kNPerM.xy[p], y.xf],
            [map.kNPerM.xy[p], map.kNPerM.yy[p], y.yf],
            [y.xf, y.yf, y.ff],
          ];
          const M = [
            [m.xKg, 0, 0],
            [0, m.yKg, m.couplingKgM],
            [0, m.couplingKgM, m.yawInertiaKgM2],
          ];
          const r = eigs(multiply(inv(M), K) as number[][]);
          const pairs = (r.eigenvectors as { value: number; vector: number[] }[]).map((e) => ({
            value: Number(e.value),
            v: (e.vector as number[]).map(Number),
          }));
          pairs.sort((a, b) => a.value - b.value);
          const yawPair = pairs.find((e) => Math.abs(e.v[2]) * (span / 2000) > Math.max(Math.abs(e.v[0]), Math.abs(e.v[1])))!;
          expect(yaw[iy][ix]).toBeCloseTo(Math.sqrt(yawPair.value) / (2 * Math.PI), 6);
          expect(yaw[iy][ix]).toBeGreaterThan(50);
        }
    },
  );
});

describe('stiffnessMap with a cross shaft', () => {
  it('when one Y motor drives the far belt through a shaft, then K_yy is the two belts, the shaft and the motor condensed by hand (library: mathjs lusolve)', () => {
    // Arrange: energy ½k_L(y−m)² + ½k_R(y−s)² + ½k_s(s−m)² + ½k_m·m²; condensing the motor m and the far pulley s
    const { inp, t, d } = setup('cartesian', 1, 3);
    const ks = 2e5;
    const map = stiffnessMap({ ...inp, shaft: { loopId: 'YR', stiffnessNPerM: ks } });
    const rigid = stiffnessMap({ ...inp, shaft: { loopId: 'YR', stiffnessNPerM: 1e15 } });
    const plain = stiffnessMap(inp);
    const p = 4; // the middle of a 3 × 3 grid
    const cx = t.originXMm + map.xMm[1];
    const cy = t.originYMm + map.yMm[1];
    const ea = d.belt.axialStiffnessN;
    const beltK = (i: number) => solveLoop(t.layout.loops[i], cx, cy).pieces.reduce((s, pc) => s + ea / (pc.lengthMm / 1000), 0);
    const kL = beltK(1);
    const kR = beltK(2);
    const km = inp.motorStiffnessNPerM.B;
    // for y = 1: [k_L + k_s + k_m, −k_s; −k_s, k_R + k_s]·[m; s] = [k_L; k_R]
    const [[m], [s]] = lusolve(
      [
        [kL + ks + km, -ks],
        [-ks, kR + ks],
      ],
      [[kL], [kR]],
    ) as number[][];
    const expected = kL * (1 - m) ** 2 + kR * (1 - s) ** 2 + ks * (s - m) ** 2 + km * m * m;
    // Act / Assert
    expect(map.kNPerM.yy[p] / expected).toBeCloseTo(1, 9);
    expect(rigid.kNPerM.yy[p] / plain.kNPerM.yy[p]).toBeCloseTo(1, 6);
    expect(map.lowestFrequencyHz[1][1]).toBeLessThan(plain.lowestFrequencyHz[1][1]);
  });
});
