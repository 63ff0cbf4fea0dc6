import { describe, expect, it } from 'vitest';
import {
  carriageStiffnessNPerM,
  defaultDesign,
  evaluateDesign,
  frameToTravel,
  kinematicsMatrix,
  lowestEigenvalue2,
  naturalFrequencyHz,
  solveLoop,
  stiffnessMap,
  type DesignInput,
  type StiffnessInput,
} from '@/engine';
import { randomDesign, SEEDS } from './helpers/randomDesign';

function inputFor(d: DesignInput, kMotor: number, points = 9): StiffnessInput {
  const t = frameToTravel(d);
  return {
    models: t.models,
    motorStiffnessNPerM: { A: kMotor, B: kMotor, B2: kMotor },
    axialStiffnessN: d.belt.axialStiffnessN,
    xKg: 0.4,
    yKg: 0.9,
    originXMm: t.originXMm,
    originYMm: t.originYMm,
    travelXMm: t.xMm,
    travelYMm: t.yMm,
    points,
  };
}

const series = (a: number, b: number) => 1 / (1 / a + 1 / b);

describe('carriageStiffnessNPerM', () => {
  it.each([
    [0.2, 0.3],
    [0.9, 0.1],
    [0.5, 0.5],
  ])(
    'when a crossed-belt carriage sits at (%d, %d) of its travel, then K_c = Kᵀ·diag(k_A, k_B)·K with k = EA(1/L₁ + 1/L₂) in series with the motor',
    (fx, fy) => {
      // Arrange: docs/models/stiffness-and-ringing.md, each loop's two arms in parallel (Rao ch. 1, springs in parallel, from memory), in series with k_θ/r²
      const d = defaultDesign('corexy');
      const t = frameToTravel(d);
      const kMotor = 2.5e5;
      const x = t.originXMm + fx * t.xMm;
      const y = t.originYMm + fy * t.yMm;
      const k = kinematicsMatrix('corexy');
      const loopK = t.layout.loops.map((loop) => {
        const arms = solveLoop(loop, x, y).pieces.map((p) => p.lengthMm / 1000);
        return series(d.belt.axialStiffnessN * (1 / arms[0] + 1 / arms[1]), kMotor);
      });
      const expected = [
        [loopK[0] * k[0][0] * k[0][0] + loopK[1] * k[1][0] * k[1][0], loopK[0] * k[0][0] * k[0][1] + loopK[1] * k[1][0] * k[1][1]],
        [0, loopK[0] * k[0][1] * k[0][1] + loopK[1] * k[1][1] * k[1][1]],
      ];
      // Act
      const kc = carriageStiffnessNPerM(inputFor(d, kMotor), x, y);
      // Assert
      expect(kc[0][0]).toBeCloseTo(expected[0][0], 3);
      expect(kc[0][1]).toBeCloseTo(expected[0][1], 3);
      expect(kc[1][0]).toBeCloseTo(expected[0][1], 3);
      expect(kc[1][1]).toBeCloseTo(expected[1][1], 3);
    },
  );

  it.each([
    [1, 'one Y motor turns both Y belts through the cross shaft: (k_L + k_R) in series with one motor'],
    [2, 'each Y belt has its own motor: each side in series with its motor, then in parallel'],
  ] as const)('when a cartesian stage has %i Y motor(s), then K_c is diagonal and k_y follows the drive (%s)', (yMotors, _why) => {
    const d = { ...defaultDesign('cartesian'), yMotors } as DesignInput;
    const t = frameToTravel(d);
    const kMotor = 3e5;
    const x = t.originXMm + 0.4 * t.xMm;
    const y = t.originYMm + 0.7 * t.yMm;
    const ea = d.belt.axialStiffnessN;
    const arms = t.layout.loops.map((loop) => solveLoop(loop, x, y).pieces.map((p) => p.lengthMm / 1000));
    const kArms = arms.map((a) => ea * (1 / a[0] + 1 / a[1]));
    const kx = series(kArms[0], kMotor);
    const ky = yMotors === 1 ? series(kArms[1] + kArms[2], kMotor) : series(kArms[1], kMotor) + series(kArms[2], kMotor);
    const kc = carriageStiffnessNPerM(inputFor(d, kMotor), x, y);
    expect(kc[0][0]).toBeCloseTo(kx, 3);
    expect(kc[1][1]).toBeCloseTo(ky, 3);
    expect(kc[0][1]).toBeCloseTo(0, 6);
  });
});

/**
 * Independent carriage stiffness: the potential energy of the belt pieces as springs EA/L, stretched by the change of
 * their geometric length (solveLoop at the displaced carriage, not the affine model) and by the belt each motor
 * pulley lets through, minimised over the motor pulleys held by springs k_m (a small Gaussian elimination); the
 * stiffness matrix is the finite-difference Hessian of that energy.
 */
function finiteDifferenceStiffnessNPerM(d: DesignInput, kMotorNPerM: number, xMm: number, yMm: number): number[][] {
  const t = frameToTravel(d);
  const base = t.layout.loops.map((loop) => solveLoop(loop, xMm, yMm));
  const vars = [...new Set(base.flatMap((b) => b.nodeMotors))];
  const energy = (dx: number, dy: number): number => {
    // stretch δ = a + Σ c·m for every piece: quadratic in m; minimise ½Σk·δ² + ½Σk_m·m² by solving H·m = −g.
    const rows: { k: number; a: number; c: number[] }[] = [];
    t.layout.loops.forEach((loop, li) => {
      const now = solveLoop(loop, xMm + dx, yMm + dy);
      now.pieces.forEach((p, i) => {
        const c = new Array<number>(vars.length).fill(0);
        if (i > 0) c[vars.indexOf(base[li].nodeMotors[i - 1])] -= 1;
        if (i < base[li].nodeMotors.length) c[vars.indexOf(base[li].nodeMotors[i])] += 1;
        rows.push({ k: d.belt.axialStiffnessN / base[li].pieces[i].lengthMm, a: p.lengthMm - base[li].pieces[i].lengthMm, c });
      });
    });
    const n = vars.length;
    const h = Array.from({ length: n }, (_, i) => Array.from({ length: n + 1 }, (_, j) => (i === j ? kMotorNPerM / 1000 : 0)));
    for (const r of rows)
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) h[i][j] += r.k * r.c[i] * r.c[j];
        h[i][n] -= r.k * r.c[i] * r.a;
      }
    for (let c = 0; c < n; c++)
      for (let r = c + 1; r < n; r++) {
        const f = h[r][c] / h[c][c];
        for (let j = c; j <= n; j++) h[r][j] -= f * h[c][j];
      }
    const m = new Array<number>(n).fill(0);
    for (let r = n - 1; r >= 0; r--) {
      let v = h[r][n];
      for (let j = r + 1; j < n; j++) v -= h[r][j] * m[j];
      m[r] = v / h[r][r];
    }
    let u = m.reduce((s, mi) => s + 0.5 * (kMotorNPerM / 1000) * mi * mi, 0);
    for (const r of rows) u += 0.5 * r.k * (r.a + r.c.reduce((s, ci, i) => s + ci * m[i], 0)) ** 2;
    return u; // N·mm
  };
  const e = 0.01; // mm
  const u0 = energy(0, 0);
  const kxx = (energy(e, 0) - 2 * u0 + energy(-e, 0)) / (e * e);
  const kyy = (energy(0, e) - 2 * u0 + energy(0, -e)) / (e * e);
  const kxy = (energy(e, e) - energy(e, -e) - energy(-e, e) + energy(-e, -e)) / (4 * e * e);
  return [
    [kxx * 1000, kxy * 1000],
    [kxy * 1000, kyy * 1000],
  ];
}

describe('carriageStiffnessNPerM against a finite-difference energy Hessian (independent)', () => {
  it.each(
    (['corexy', 'hbot', 'cartesian'] as const).flatMap((m) =>
      [
        [0.5, 0.5],
        [0.1, 0.85],
        [0.95, 0.2],
      ].map(([fx, fy]) => [m, fx, fy] as const),
    ),
  )('when a %s carriage sits at (%d, %d) of its travel, then K_c matches the Hessian within 0.1 %', (mech, fx, fy) => {
    // Arrange
    const d = defaultDesign(mech);
    const t = frameToTravel(d);
    const kMotor = 2.5e5;
    const x = t.originXMm + fx * t.xMm;
    const y = t.originYMm + fy * t.yMm;
    const expected = finiteDifferenceStiffnessNPerM(d, kMotor, x, y);
    // Act
    const kc = carriageStiffnessNPerM(inputFor(d, kMotor), x, y);
    // Assert
    const scale = Math.max(Math.abs(expected[0][0]), Math.abs(expected[1][1]));
    for (const [i, j] of [
      [0, 0],
      [0, 1],
      [1, 1],
    ])
      expect(Math.abs(kc[i][j] - expected[i][j])).toBeLessThan(1e-3 * scale);
  });
});

describe('stiffnessMap', () => {
  it.each((['corexy', 'hbot'] as const).flatMap((m) => SEEDS.slice(0, 6).map((s) => [m, s] as const)))(
    'when a symmetric %s layout (seed %i) is mapped, then the map is mirror-symmetric about the travel centre line',
    (mech, seed) => {
      const res = evaluateDesign({ ...randomDesign(seed, mech), map: { points: 15 } });
      const f = res.stiffness.lowestFrequencyHz;
      for (const row of f) for (let i = 0; i < row.length; i++) expect(row[row.length - 1 - i]).toBeCloseTo(row[i], 6);
    },
  );

  it('when the carriage is uncoupled (cartesian), then each point is the lower spring–mass frequency (Rao, from memory)', () => {
    const d = defaultDesign('cartesian');
    const inp = inputFor(d, 4e5, 5);
    const map = stiffnessMap(inp);
    map.yMm.forEach((yy, iy) =>
      map.xMm.forEach((xx, ix) => {
        const kc = carriageStiffnessNPerM(inp, inp.originXMm + xx, inp.originYMm + yy);
        const expected = Math.min(
          naturalFrequencyHz({ stiffnessNPerM: kc[0][0], massKg: 0.4 }),
          naturalFrequencyHz({ stiffnessNPerM: kc[1][1], massKg: 0.9 }),
        );
        expect(map.lowestFrequencyHz[iy][ix]).toBeCloseTo(expected, 6);
      }),
    );
  });

  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when the %s map is computed point by point instead, then both agree (fast path = condensation)',
    (mech) => {
      const d = { ...randomDesign(21, mech), yMotors: mech === 'cartesian' ? 2 : 1 } as DesignInput;
      const inp = inputFor(d, 3e5, 6);
      const map = stiffnessMap(inp);
      map.yMm.forEach((yy, iy) =>
        map.xMm.forEach((xx, ix) => {
          const kc = carriageStiffnessNPerM(inp, inp.originXMm + xx, inp.originYMm + yy);
          const lam = lowestEigenvalue2(kc[0][0], kc[0][1], kc[1][1], inp.xKg, inp.yKg);
          expect(map.lowestFrequencyHz[iy][ix]).toBeCloseTo(Math.sqrt(lam) / (2 * Math.PI), 6);
        }),
      );
    },
  );

  it('when the map is computed, then its minimum is the smallest grid value and lies on the grid', () => {
    const map = stiffnessMap(inputFor(defaultDesign('corexy'), 2e5, 11));
    const all = map.lowestFrequencyHz.flat();
    expect(map.min.frequencyHz).toBe(Math.min(...all));
    expect(map.xMm).toContain(map.min.xMm);
    expect(map.yMm).toContain(map.min.yMm);
    expect(map.lowestFrequencyHz).toHaveLength(11);
    expect(map.lowestFrequencyHz[0]).toHaveLength(11);
  });

  it('when the belt is twice as stiff, then every point rings higher', () => {
    const d = defaultDesign('hbot');
    const a = stiffnessMap(inputFor(d, 2e5, 7));
    const b = stiffnessMap({ ...inputFor(d, 2e5, 7), axialStiffnessN: 2 * d.belt.axialStiffnessN });
    a.lowestFrequencyHz.forEach((row, iy) => row.forEach((v, ix) => expect(b.lowestFrequencyHz[iy][ix]).toBeGreaterThan(v)));
  });
});
