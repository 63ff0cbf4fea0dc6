import { describe, expect, it } from 'vitest';
import {
  effectivePeakCurrentA,
  interpolateTorqueCurve,
  modelTopSpeedRevPerS,
  motorHoldingStiffnessNmPerRad,
  motorTorqueNm,
  pullOutTorqueNm,
  torqueConstantNmPerA,
  type DriverSpec,
  type MotorSpec,
} from '@/engine';
import { searchPullOutNm } from '../../../reference/stepper-phasor-model/bruteForceSearch';

// A typical 0.45 N·m, 1.5 A, 1.8 Ω, 3.2 mH, 1.8° motor on 24 V (the Design desk's template motor; invented, not a datasheet).
const typical: MotorSpec = {
  stepAngleDeg: 1.8,
  holdingTorqueNm: 0.45,
  ratedCurrentA: 1.5,
  phaseResistanceOhm: 1.8,
  phaseInductanceMh: 3.2,
  rotorInertiaKgM2: 5.7e-6,
  massKg: 0.28,
  torqueCurve: null,
};
const typicalDriver: DriverSpec = { microsteps: 16, supplyV: 24, currentRmsA: 1.5 };

/**
 * Independent pull-out torque: the brute-force search over the driver's voltage phasor that produced the reference
 * table's `independent` rows (reference/stepper-phasor-model/bruteForceSearch.ts: the current from the circuit
 * I = (V_s − E)/Z in complex arithmetic, feasible when |I| ≤ I_p; built from the circuit equation, not from the
 * engine's circle geometry), on a coarser grid so that sixty cases stay quick.
 */
function bruteForcePullOutNm(motor: MotorSpec, driver: DriverSpec, speedRevPerS: number): number {
  const input = { ...motor, supplyV: driver.supplyV, currentRmsA: driver.currentRmsA, speedRevPerS };
  return searchPullOutNm(input, [
    [200, 720],
    [60, 60],
    [60, 60],
    [60, 60],
  ]);
}

describe('pullOutTorqueNm', () => {
  const motors: [string, MotorSpec, DriverSpec][] = [
    ['the typical 0.45 N·m motor on 24 V', typical, typicalDriver],
    ['the typical motor at 1.2 A on 24 V', typical, { ...typicalDriver, currentRmsA: 1.2 }],
    ['a 0.9° motor (N_r = 100) on 36 V', { ...typical, stepAngleDeg: 0.9, phaseInductanceMh: 4.5 }, { ...typicalDriver, supplyV: 36 }],
    ['a low-current setting whose current circle leaves the voltage circle at speed', typical, { ...typicalDriver, currentRmsA: 0.5 }],
    [
      'a high-resistance motor on 12 V',
      { ...typical, phaseResistanceOhm: 6, phaseInductanceMh: 9 },
      { ...typicalDriver, supplyV: 12, currentRmsA: 0.8 },
    ],
  ];
  const speeds = [0, 1, 3, 6, 10, 15, 18, 20, 25, 35, 50, 80];
  it.each(motors.flatMap(([name, m, d]) => speeds.map((n) => [name, n, m, d] as const)))(
    'when %s turns at %d rev/s, then the closed form matches a brute-force load-angle search within 1 % (independent)',
    (_name, n, motor, driver) => {
      // Arrange
      const expected = bruteForcePullOutNm(motor, driver, n);
      // Act
      const torque = pullOutTorqueNm({ motor, driver, speedRevPerS: n });
      // Assert: the search can only find a feasible point, so it never beats the optimum by more than round-off.
      expect(torque).toBeGreaterThanOrEqual(expected - 1e-9);
      expect(Math.abs(torque - expected)).toBeLessThanOrEqual(
        0.01 * Math.max(expected, 0.01 * pullOutTorqueNm({ motor, driver, speedRevPerS: 0 })),
      );
    },
  );

  it('when the typical 0.45 N·m motor turns at 20 rev/s on 24 V, then it still gives about 0.22 N·m', () => {
    // Arrange / Act
    const torque = pullOutTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: 20 });
    // Assert: V/k_e = 24 V ÷ 0.2121 V·s/rad = 18.0 rev/s, so the old current-in-phase model gave 0 here.
    expect(torque).toBeGreaterThan(0.21);
    expect(torque).toBeLessThan(0.235);
  });

  it('when the speed rises past V/k_e, then the torque falls smoothly and stays positive (no ceiling)', () => {
    // Arrange
    const backEmfRevPerS = 24 / torqueConstantNmPerA(typical) / (2 * Math.PI);
    let last = Infinity;
    // Act / Assert
    for (let n = 0; n <= 4 * backEmfRevPerS; n += 0.25) {
      const t = pullOutTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: n });
      expect(t).toBeLessThanOrEqual(last + 1e-12);
      expect(t).toBeGreaterThan(0);
      last = t;
    }
  });

  it('when the driver current is above the rating, then the torque is that of the rated current at every speed', () => {
    // Arrange
    const over = { ...typicalDriver, currentRmsA: 3 };
    // Act / Assert
    for (const n of [0, 5, 12, 20, 40]) {
      expect(pullOutTorqueNm({ motor: typical, driver: over, speedRevPerS: n })).toBe(
        pullOutTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: n }),
      );
    }
  });

  it('when the motor is missing, then it throws naming motor', () => {
    expect(() => pullOutTorqueNm({ motor: undefined as unknown as MotorSpec, driver: typicalDriver, speedRevPerS: 1 })).toThrow(
      /\[pullOutTorqueNm\] motor/,
    );
  });
});

describe('motorTorqueNm', () => {
  it('when the motor has no torque table, then it gives the pull-out torque', () => {
    for (const n of [0, 7, 19, 33]) {
      expect(motorTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: n })).toBe(
        pullOutTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: n }),
      );
    }
  });

  it('when a torque table is given, then it replaces the model', () => {
    const m = {
      ...typical,
      torqueCurve: [
        { speedRevPerS: 0, torqueNm: 0.4 },
        { speedRevPerS: 10, torqueNm: 0.2 },
      ],
    };
    expect(motorTorqueNm({ motor: m, driver: typicalDriver, speedRevPerS: 5 })).toBeCloseTo(0.3, 12);
  });

  it.each([
    [0.75, 1.5],
    [1.2, 1.5],
    [2.5, 1.5],
  ])('when the driver runs %d A RMS of a %d A motor at standstill, then τ = T_hold·min(I_rms, I_rated)/I_rated', (iRms, rated) => {
    // Hand value: 0.45 N·m × min(I_rms, 1.5 A) / 1.5 A
    expect(motorTorqueNm({ motor: typical, driver: { ...typicalDriver, currentRmsA: iRms }, speedRevPerS: 0 })).toBeCloseTo(
      (0.45 * Math.min(iRms, rated)) / rated,
      9,
    );
  });

  it('when the motor is missing, then it throws naming motor', () => {
    expect(() => motorTorqueNm({ motor: undefined as unknown as MotorSpec, driver: typicalDriver, speedRevPerS: 1 })).toThrow(
      /\[motorTorqueNm\] motor/,
    );
  });
});

describe('torqueConstantNmPerA', () => {
  it('when T_hold = 0.45 N·m at 1.5 A, then k_t = 0.45/(√2·1.5) = 0.212132 N·m/A (hand value)', () => {
    expect(torqueConstantNmPerA(typical)).toBeCloseTo(0.212132, 6);
  });
});

describe('effectivePeakCurrentA', () => {
  it.each([
    [1.2, 1.2 * Math.SQRT2],
    [1.5, 1.5 * Math.SQRT2],
    [3, 1.5 * Math.SQRT2],
  ])('when the driver is set to %d A RMS on a 1.5 A motor, then the model uses a peak of %d A', (rms, peak) => {
    expect(effectivePeakCurrentA(typical, { currentRmsA: rms })).toBeCloseTo(peak, 12);
  });
});

describe('modelTopSpeedRevPerS', () => {
  it('when the typical motor is sampled, then its curve ends at 5·V/k_e, where it still has more than 5 % of its standstill torque', () => {
    // Arrange
    const backEmf = 24 / torqueConstantNmPerA(typical) / (2 * Math.PI);
    // Act
    const top = modelTopSpeedRevPerS(typical, typicalDriver);
    // Assert
    expect(top).toBeCloseTo(5 * backEmf, 9);
    expect(pullOutTorqueNm({ motor: typical, driver: typicalDriver, speedRevPerS: top })).toBeGreaterThan(0.05 * 0.45);
  });

  it('when a motor loses torque fast, then its curve ends where the torque falls to 5 % of the standstill torque', () => {
    // Arrange
    const motor = { ...typical, phaseResistanceOhm: 6, phaseInductanceMh: 20 };
    const driver = { ...typicalDriver, supplyV: 12 };
    // Act
    const top = modelTopSpeedRevPerS(motor, driver);
    // Assert
    const standstill = pullOutTorqueNm({ motor, driver, speedRevPerS: 0 });
    expect(pullOutTorqueNm({ motor, driver, speedRevPerS: top })).toBeCloseTo(0.05 * standstill, 6);
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
  it('when a 1.8° motor is driven at its rating, then k_θ = N_r·T_hold = 50 × 0.45 N·m/rad', () => {
    expect(motorHoldingStiffnessNmPerRad(typical, typicalDriver)).toBeCloseTo(22.5, 9);
  });

  it('when it is driven at half its rating, then the stiffness halves with the torque', () => {
    expect(motorHoldingStiffnessNmPerRad(typical, { ...typicalDriver, currentRmsA: 0.75 })).toBeCloseTo(11.25, 9);
  });

  it('when it is driven above its rating, then the stiffness stays at the rated value', () => {
    expect(motorHoldingStiffnessNmPerRad(typical, { ...typicalDriver, currentRmsA: 3 })).toBeCloseTo(22.5, 9);
  });
});
