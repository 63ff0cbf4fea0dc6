import { inv } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { biggestErrorTerm, carriageErrorMm, errorBudgetMap, loadAngleErrorMm, microstepDeadband, type Matrix2 } from '@/engine';

describe('loadAngleErrorMm', () => {
  it('when the load is small, then the lag is r·τ/(N_r·T) (derived: linear holding stiffness k_θ = N_r·T)', () => {
    expect(loadAngleErrorMm({ torqueNm: 1e-6, holdingTorqueNm: 0.45, rotorTeeth: 50, pulleyRadiusMm: 6.366 })).toBeCloseTo(
      (6.366 * 1e-6) / (50 * 0.45),
      14,
    );
  });

  it('when 60 % of the holding torque is applied, then the lag solves T·sin(N_r·δ) = τ (independent: bisection on the torque–angle curve)', () => {
    // Arrange
    const t = 0.45;
    const tau = 0.27;
    let lo = 0;
    let hi = Math.PI / 2 / 50;
    for (let i = 0; i < 100; i++) {
      const mid = (lo + hi) / 2;
      if (t * Math.sin(50 * mid) < tau) lo = mid;
      else hi = mid;
    }
    // Act / Assert
    expect(loadAngleErrorMm({ torqueNm: tau, holdingTorqueNm: t, rotorTeeth: 50, pulleyRadiusMm: 6.366 })).toBeCloseTo(6.366 * lo, 12);
  });

  it('when the load exceeds the holding torque, then the lag stops at a quarter tooth pitch', () => {
    expect(loadAngleErrorMm({ torqueNm: 1, holdingTorqueNm: 0.45, rotorTeeth: 50, pulleyRadiusMm: 10 })).toBeCloseTo(
      (10 * Math.PI) / 2 / 50,
      12,
    );
  });
});

describe('microstepDeadband', () => {
  it('when 2 N of friction meets a 0.45 N·m motor on a 20-tooth 2 mm pulley at 1/16, then single microsteps still move (derived: T·sin(π/32) = 0.0441 N·m > 0.0127 N·m)', () => {
    // Act
    const d = microstepDeadband({
      frictionTorqueNm: 2 * 0.0063662,
      holdingTorqueNm: 0.45,
      rotorTeeth: 50,
      microsteps: 16,
      pulleyRadiusMm: 6.3662,
    });
    // Assert
    expect(d.torquePerMicrostepNm).toBeCloseTo(0.45 * Math.sin(Math.PI / 32), 12);
    expect(d.isSingleMicrostepEffective).toBe(true);
    expect(d.microsteps).toBeLessThan(1);
  });

  it('when the same motor runs 1/256, then friction swallows several microsteps (derived: asin(τ_f/T)/(π/512) ≈ 4.6)', () => {
    // Act
    const d = microstepDeadband({
      frictionTorqueNm: 2 * 0.0063662,
      holdingTorqueNm: 0.45,
      rotorTeeth: 50,
      microsteps: 256,
      pulleyRadiusMm: 6.3662,
    });
    // Assert
    expect(d.isSingleMicrostepEffective).toBe(false);
    expect(d.microsteps).toBeCloseTo(Math.asin((2 * 0.0063662) / 0.45) / (Math.PI / 512), 10);
    expect(d.microsteps).toBeGreaterThan(4.5);
    expect(d.deadbandMm).toBeCloseTo((6.3662 * Math.asin((2 * 0.0063662) / 0.45)) / 50, 12);
  });
});

describe('carriageErrorMm', () => {
  it.each([
    // crossed belts: K⁻¹ = ½[[1, 1], [1, −1]]; equal belt errors e move the carriage e along an axis (derived)
    [
      [
        [0.5, 0.5],
        [0.5, -0.5],
      ],
      0.02,
      0.02,
      0.02,
    ],
    // cartesian: K⁻¹ = I; both axes wrong at once → e·√2 along the diagonal (derived)
    [
      [
        [1, 0],
        [0, 1],
      ],
      0.02,
      0.02,
      0.02 * Math.SQRT2,
    ],
  ])('when K⁻¹ is %j and the belt errors are %d and %d mm, then the carriage can be %d mm off', (kinv, a, b, expected) => {
    expect(carriageErrorMm(kinv as Matrix2, a, b)).toBeCloseTo(expected, 12);
  });
});

describe('errorBudgetMap', () => {
  const directions = Array.from({ length: 72 }, (_, i) => i * 5);
  const force = directions.map((d) => [
    8 * Math.cos((d * Math.PI) / 180) + 2 * Math.sign(Math.round(Math.cos((d * Math.PI) / 180) * 1e9)),
    12 * Math.sin((d * Math.PI) / 180),
  ]);

  it('when every point has the same stiffness, then each term adds to a flat map equal to the worst point (derived)', () => {
    // Arrange: k = 2e5 N/m both ways, motors 1e6 N/m of belt → compliance without them 1/2e5 − 1/1e6
    const n = 4;
    const k = 2e5;
    const cm = 1 / 1e6;
    const inp = {
      xMm: [0, 100],
      yMm: [0, 100],
      kxxNPerM: new Float64Array(n).fill(k),
      kxyNPerM: new Float64Array(n).fill(0),
      kyyNPerM: new Float64Array(n).fill(k),
      motorComplianceMPerN: [
        [cm, 0],
        [0, cm],
      ] as Matrix2,
      directionsDeg: directions,
      forceXN: force.map((f) => f[0]),
      forceYN: force.map((f) => f[1]),
      loadAngleMm: directions.map(() => 0.001),
      deadbandMm: 0.002,
      runoutMm: 0.02,
      mapStride: 1,
    };
    // Act
    const r = errorBudgetMap(inp);
    // Assert
    const maxF = Math.max(...force.map((f) => Math.hypot(f[0], f[1])));
    expect(r.worst.stretchMm).toBeCloseTo(maxF * (1 / k - cm) * 1000, 12);
    expect(r.worst.totalMm).toBeCloseTo(r.worst.stretchMm + 0.001 + 0.002 + 0.02, 12);
    r.totalMm.flat().forEach((v) => expect(v).toBeCloseTo(r.worst.totalMm, 12));
  });

  it('when the stiffness varies over the grid, then each point is the worst direction of |C·F| (library: mathjs inverse)', () => {
    // Arrange
    const xs = [0, 50, 100];
    const ys = [0, 80];
    const kxx: number[] = [];
    const kxy: number[] = [];
    const kyy: number[] = [];
    ys.forEach((_, iy) =>
      xs.forEach((_, ix) => {
        kxx.push(1.5e5 + 4e4 * ix);
        kxy.push(-2e4 + 1e4 * iy);
        kyy.push(1e5 + 3e4 * iy + 1e4 * ix);
      }),
    );
    const cm: Matrix2 = [
      [2e-7, 5e-8],
      [5e-8, 3e-7],
    ];
    const inp = {
      xMm: xs,
      yMm: ys,
      kxxNPerM: Float64Array.from(kxx),
      kxyNPerM: Float64Array.from(kxy),
      kyyNPerM: Float64Array.from(kyy),
      motorComplianceMPerN: cm,
      directionsDeg: directions,
      forceXN: force.map((f) => f[0]),
      forceYN: force.map((f) => f[1]),
      loadAngleMm: directions.map((d) => 0.001 * (1 + Math.abs(Math.sin((d * Math.PI) / 90)))),
      deadbandMm: 0.001,
      runoutMm: 0.01,
      mapStride: 1,
    };
    // Act
    const r = errorBudgetMap(inp);
    // Assert
    ys.forEach((_, iy) =>
      xs.forEach((_, ix) => {
        const p = iy * xs.length + ix;
        const c = inv([
          [kxx[p], kxy[p]],
          [kxy[p], kyy[p]],
        ]) as number[][];
        const cb = [
          [c[0][0] - cm[0][0], c[0][1] - cm[0][1]],
          [c[1][0] - cm[1][0], c[1][1] - cm[1][1]],
        ];
        const expected = Math.max(
          ...force.map(
            (f, i) => Math.hypot(cb[0][0] * f[0] + cb[0][1] * f[1], cb[1][0] * f[0] + cb[1][1] * f[1]) * 1000 + inp.loadAngleMm[i] + 0.011,
          ),
        );
        expect(r.totalMm[iy][ix]).toBeCloseTo(expected, 10);
      }),
    );
    expect(r.worst.totalMm).toBeCloseTo(Math.max(...r.totalMm.flat()), 12);
  });

  it('when opposite directions differ (an unsymmetric stage), then every direction is still searched (independent: brute force)', () => {
    // Arrange: a force offset that does not reverse with the direction
    const fx = force.map((f) => f[0] + 5);
    const fy = force.map((f) => f[1]);
    const inp = {
      xMm: [0],
      yMm: [0],
      kxxNPerM: Float64Array.from([1e5]),
      kxyNPerM: Float64Array.from([0]),
      kyyNPerM: Float64Array.from([1e5]),
      motorComplianceMPerN: [
        [0, 0],
        [0, 0],
      ] as Matrix2,
      directionsDeg: directions,
      forceXN: fx,
      forceYN: fy,
      loadAngleMm: directions.map(() => 0),
      deadbandMm: 0,
      runoutMm: 0,
      mapStride: 1,
    };
    // Act
    const r = errorBudgetMap(inp);
    // Assert
    const brute = Math.max(...fx.map((x, i) => (Math.hypot(x, fy[i]) / 1e5) * 1000));
    expect(r.totalMm[0][0]).toBeCloseTo(brute, 12);
  });

  it('when the map samples every 6th direction, then it never reports more than the full check at the worst point', () => {
    // Arrange
    const n = 1;
    const inp = {
      xMm: [0],
      yMm: [0],
      kxxNPerM: new Float64Array(n).fill(1e5),
      kxyNPerM: new Float64Array(n).fill(3e4),
      kyyNPerM: new Float64Array(n).fill(2e5),
      motorComplianceMPerN: [
        [0, 0],
        [0, 0],
      ] as Matrix2,
      directionsDeg: directions,
      forceXN: force.map((f) => f[0]),
      forceYN: force.map((f) => f[1]),
      loadAngleMm: directions.map(() => 0),
      deadbandMm: 0,
      runoutMm: 0,
      mapStride: 6,
    };
    // Act
    const r = errorBudgetMap(inp);
    // Assert
    expect(r.totalMm[0][0]).toBeCloseTo(r.worst.totalMm, 12);
  });
});

describe('biggestErrorTerm', () => {
  it('when belt stretch dominates, then the advice names the belt stiffness and the acceleration with their values', () => {
    // Act
    const b = biggestErrorTerm(
      { stretchMm: 0.05, loadAngleMm: 0.01, deadbandMm: 0.002, runoutMm: 0.02, totalMm: 0.082, xMm: 0, yMm: 0, directionDeg: 0 },
      { axialStiffnessN: 40000, accelMPerS2: 3, holdingTorqueNm: 0.45, frictionXN: 2, frictionYN: 3, runoutMm: 0.02 },
    );
    // Assert
    expect(b.term).toBe('stretch');
    expect(b.message).toContain('40000 N');
    expect(b.message).toContain('0.025 mm');
  });

  it('when runout dominates, then the advice names the eccentricity', () => {
    const b = biggestErrorTerm(
      { stretchMm: 0.005, loadAngleMm: 0.004, deadbandMm: 0.001, runoutMm: 0.05, totalMm: 0.06, xMm: 0, yMm: 0, directionDeg: 0 },
      { axialStiffnessN: 40000, accelMPerS2: 3, holdingTorqueNm: 0.45, frictionXN: 2, frictionYN: 3, runoutMm: 0.05 },
    );
    expect(b.term).toBe('runout');
    expect(b.message).toMatch(/eccentricity \(now 0\.05 mm\)/);
  });
});
