import { describe, expect, it } from 'vitest';
import {
  interpolateTorqueCurve,
  motorHoldingStiffnessNmPerRad,
  motorTorqueNm,
  supplyLimitedCurrentA,
  torqueConstantNmPerA,
  type DriverSpec,
  type MotorSpec,
} from '@/engine';

// Illustrative inputs of the project's reference collection (not a datasheet): R = 1.65 Ω, L = 2.8 mH,
// k_t = k_e = 0.25 N·m/A, V = 24 V, peak current 1.5 A, N_r = 50.
const motor: MotorSpec = {
  stepAngleDeg: 1.8,
  holdingTorqueNm: 0.25 * Math.SQRT2 * 1.5,
  ratedCurrentA: 1.5,
  phaseResistanceOhm: 1.65,
  phaseInductanceMh: 2.8,
  rotorInertiaKgM2: 5.7e-6,
  massKg: 0.28,
  torqueCurve: null,
};
const driver: DriverSpec = { microsteps: 16, supplyV: 24, currentRmsA: 1.5 / Math.SQRT2 };

describe('torqueConstantNmPerA', () => {
  it('when T_hold = 0.5303 N·m at 1.5 A, then k_t = T_hold/(√2·I_rated) = 0.25 N·m/A (engine.md §5)', () => {
    expect(torqueConstantNmPerA(motor)).toBeCloseTo(0.25, 12);
  });
});

describe('supplyLimitedCurrentA', () => {
  it.each([5, 10, 14, 15])('when the shaft turns at %d rev/s, then the current solves V² = (I·R + k_e·ω)² + (I·ω_e·L)²', (n) => {
    const w = 2 * Math.PI * n;
    const i = supplyLimitedCurrentA({ motor, supplyV: 24, keVsPerRad: 0.25, speedRadPerS: w });
    const x = 50 * w * 2.8e-3;
    expect((i * 1.65 + 0.25 * w) ** 2 + (i * x) ** 2).toBeCloseTo(24 * 24, 6);
  });

  it('when back-EMF reaches the supply (ω = V/k_e), then no current flows', () => {
    expect(supplyLimitedCurrentA({ motor, supplyV: 24, keVsPerRad: 0.25, speedRadPerS: 24 / 0.25 })).toBe(0);
  });
});

describe('motorTorqueNm', () => {
  it.each([
    // phasor model (attribution Kenjo & Sugawara / Acarnley, from memory): MOTOR-PHASOR-10RPS clipped, 15RPS supply-limited
    [0, 0.375],
    [10, 0.375],
    [15, 0.0469433],
  ])('when the motor turns at %d rev/s, then it gives %d N·m (phasor model, from memory)', (speedRevPerS, expected) => {
    expect(motorTorqueNm({ motor, driver, speedRevPerS })).toBeCloseTo(expected, 5);
  });

  it.each([
    // scalar model (A) rows are a lower bound of the phasor model: MOTOR-SCALAR-10RPS, -15RPS
    [10, 0.231624],
    [15, 0.00823569],
  ])('when the motor turns at %d rev/s, then it gives at least the scalar model %d N·m', (speedRevPerS, lower) => {
    expect(motorTorqueNm({ motor, driver, speedRevPerS })).toBeGreaterThanOrEqual(lower);
  });

  it.each([
    [0.75, 1.5],
    [1.2, 1.5],
  ])('when the driver runs %d A RMS of a %d A motor at low speed, then τ = T_hold·I_rms/I_rated', (iRms, rated) => {
    const m = { ...motor, ratedCurrentA: rated };
    expect(motorTorqueNm({ motor: m, driver: { ...driver, currentRmsA: iRms }, speedRevPerS: 0.01 })).toBeCloseTo(
      (m.holdingTorqueNm * iRms) / rated,
      9,
    );
  });

  it('when speed rises, then the available torque never rises (back-EMF and inductance, IBM TDB 1971)', () => {
    let last = Infinity;
    for (let n = 0; n <= 20; n += 0.25) {
      const t = motorTorqueNm({ motor, driver, speedRevPerS: n });
      expect(t).toBeLessThanOrEqual(last + 1e-12);
      last = t;
    }
    expect(motorTorqueNm({ motor, driver, speedRevPerS: 24 / 0.25 / (2 * Math.PI) + 0.01 })).toBe(0);
  });

  it('when a torque table is given, then it replaces the model', () => {
    const m = {
      ...motor,
      torqueCurve: [
        { speedRevPerS: 0, torqueNm: 0.4 },
        { speedRevPerS: 10, torqueNm: 0.2 },
      ],
    };
    expect(motorTorqueNm({ motor: m, driver, speedRevPerS: 5 })).toBeCloseTo(0.3, 12);
  });

  it('when the motor is missing, then it throws naming motor', () => {
    expect(() => motorTorqueNm({ motor: undefined as unknown as MotorSpec, driver, speedRevPerS: 1 })).toThrow(/\[motorTorqueNm\] motor/);
  });
});

describe('interpolateTorqueCurve', () => {
  const curve = [
    { speedRevPerS: 1, torqueNm: 0.5 },
    { speedRevPerS: 5, torqueNm: 0.3 },
    { speedRevPerS: 10, torqueNm: 0.1 },
  ];
  it.each([
    [0, 0.5, 'below the first speed the first torque holds'],
    [3, 0.4, 'linear between points'],
    [7.5, 0.2, 'linear between points'],
    [10, 0.1, 'the last point itself'],
    [10.5, 0, 'beyond the table no torque is promised'],
  ])('when the speed is %d rev/s, then the torque is %d N·m (%s)', (n, expected) => {
    expect(interpolateTorqueCurve(curve, n)).toBeCloseTo(expected, 12);
  });
});

describe('motorHoldingStiffnessNmPerRad', () => {
  it('when a 1.8° motor is driven at its rating, then k_θ = N_r·T_hold (engine.md §7)', () => {
    expect(motorHoldingStiffnessNmPerRad(motor, { ...driver, currentRmsA: 1.5 })).toBeCloseTo(50 * motor.holdingTorqueNm, 9);
  });

  it('when it is driven at half its rating, then the stiffness halves with the torque', () => {
    expect(motorHoldingStiffnessNmPerRad(motor, { ...driver, currentRmsA: 0.75 })).toBeCloseTo(25 * motor.holdingTorqueNm, 9);
  });
});
