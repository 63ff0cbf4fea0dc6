import { describe, expect, it } from 'vitest';
import {
  rampResidualVibrationMm,
  rampTimeForToleranceS,
  vibrationControl,
  zvdShaperDurationS,
  zvdShaperImpulses,
  zvShaperDurationS,
  zvShaperImpulses,
  type ShaperImpulse,
} from '@/engine';
import { residualAfter } from './helpers/oscillator';

/** Acceleration of a constant-acceleration velocity ramp (speed v in time T) convolved with a shaper. */
function shapedRamp(impulses: ShaperImpulse[], speedMPerS: number, rampS: number): (tS: number) => number {
  return (t) => impulses.reduce((sum, p) => sum + (t >= p.timeS && t < p.timeS + rampS ? (p.amplitude * speedMPerS) / rampS : 0), 0);
}

describe('zvShaperImpulses', () => {
  it.each([
    // derived: Singer & Seering (1990), ZV shaper: t = 0 and π/ω_d, amplitudes 1/(1+K), K/(1+K), K = exp(−ζπ/√(1−ζ²))
    [50, 0, 0.01, 0.5],
    [40, 0.05, 1 / (2 * 40 * Math.sqrt(1 - 0.0025)), 1 / (1 + Math.exp((-0.05 * Math.PI) / Math.sqrt(1 - 0.0025)))],
  ])(
    'when the mode is %d Hz with ζ = %d, then the second impulse is at %d s and the first carries %d',
    (frequencyHz, dampingRatio, t2, a1) => {
      // Act
      const p = zvShaperImpulses({ frequencyHz, dampingRatio });
      // Assert
      expect(p[0].timeS).toBe(0);
      expect(p[1].timeS).toBeCloseTo(t2, 12);
      expect(p[0].amplitude).toBeCloseTo(a1, 12);
      expect(p[0].amplitude + p[1].amplitude).toBeCloseTo(1, 12);
    },
  );

  it.each([
    [37, 0],
    [37, 0.08],
  ])('when a ramp shaped for %d Hz (ζ = %d) drives that mode, then nothing is left ringing (independent: RK4 simulation)', (f, zeta) => {
    // Arrange: a ramp time that is not a multiple of the period, so the unshaped ramp leaves vibration
    const ramp = 0.0113;
    const v = 0.3;
    const shaped = shapedRamp(zvShaperImpulses({ frequencyHz: f, dampingRatio: zeta }), v, ramp);
    const plain = shapedRamp([{ timeS: 0, amplitude: 1 }], v, ramp);
    const end = ramp + 1 / f;
    // Act
    const left = residualAfter(shaped, end, f, zeta, 40000).amplitudeM;
    const unshaped = residualAfter(plain, end, f, zeta, 40000).amplitudeM;
    // Assert
    expect(unshaped).toBeGreaterThan(1e-4);
    expect(left).toBeLessThan(unshaped * 2e-3);
  });
});

describe('zvdShaperImpulses', () => {
  it('when undamped, then the impulses are ¼, ½, ¼ at 0, half and one period (derived: Singer & Seering 1990, ZVD)', () => {
    // Act
    const p = zvdShaperImpulses({ frequencyHz: 25 });
    // Assert
    expect(p.map((x) => x.timeS)).toEqual([0, 0.02, 0.04]);
    expect(p.map((x) => x.amplitude)).toEqual([0.25, 0.5, 0.25]);
  });

  it('when the real mode is 10 % off the tuned frequency, then ZVD leaves far less than ZV (independent: RK4 simulation)', () => {
    // Arrange
    const tuned = 50;
    const actual = 55;
    const ramp = 0.007;
    const end = ramp + 2 / tuned;
    // Act
    const zv = residualAfter(shapedRamp(zvShaperImpulses({ frequencyHz: tuned }), 0.3, ramp), end, actual).amplitudeM;
    const zvd = residualAfter(shapedRamp(zvdShaperImpulses({ frequencyHz: tuned }), 0.3, ramp), end, actual).amplitudeM;
    const none = residualAfter(shapedRamp([{ timeS: 0, amplitude: 1 }], 0.3, ramp), end, actual).amplitudeM;
    // Assert: ZV keeps |cos(π·1.1/2)| ≈ 0.156 of the unshaped vibration, ZVD its square ≈ 0.024 (derived from the
    // shapers' vibration ratio, Singer & Seering 1990)
    expect(zv / none).toBeCloseTo(Math.abs(Math.cos((Math.PI * 1.1) / 2)), 2);
    expect(zvd / none).toBeCloseTo(Math.cos((Math.PI * 1.1) / 2) ** 2, 2);
  });
});

describe('zvShaperDurationS', () => {
  it.each([
    [50, 0.01],
    [20, 0.025],
  ])('when the mode is %d Hz, then ZV adds %d s (derived: half a period, Singer & Seering 1990)', (frequencyHz, expected) => {
    expect(zvShaperDurationS({ frequencyHz })).toBeCloseTo(expected, 12);
  });

  it('when the frequency is 0, then it throws naming the argument', () => {
    expect(() => zvShaperDurationS({ frequencyHz: 0 })).toThrow(/frequencyHz/);
  });
});

describe('zvdShaperDurationS', () => {
  it('when the mode is 50 Hz, then ZVD adds one period, 20 ms (derived: Singer & Seering 1990)', () => {
    expect(zvdShaperDurationS({ frequencyHz: 50 })).toBeCloseTo(0.02, 12);
  });
});

describe('rampResidualVibrationMm', () => {
  it.each([
    // [f, v, T, T_j]
    [40, 0.3, 0.0113, 0],
    [40, 0.3, 0.037, 0],
    [40, 0.3, 0.037, 0.037 / 2],
    [40, 0.3, 0.05, 0.01],
    [80, 0.5, 0.02, 0.004],
  ])(
    'when %d Hz meets a %d m/s ramp of %d s (jerk time %d s), then the closed form matches a simulation (independent: RK4)',
    (f, v, t, tj) => {
      // Arrange: trapezoidal acceleration rising in T_j, holding, falling in T_j, area v
      const peak = v / (t - tj);
      const accel = (x: number) => (x < tj ? (peak * x) / tj : x < t - tj ? peak : x < t ? (peak * (t - x)) / tj : 0);
      // Act
      const closed = rampResidualVibrationMm({ frequencyHz: f, speedMPerS: v, rampTimeS: t, jerkTimeS: tj });
      const simulated = residualAfter(accel, t, f, 0, 40000).amplitudeM * 1000;
      // Assert
      expect(closed).toBeCloseTo(simulated, 4);
    },
  );

  it('when the constant-acceleration ramp lasts exactly one period, then no vibration is left (derived: sinc(π) = 0)', () => {
    expect(rampResidualVibrationMm({ frequencyHz: 40, speedMPerS: 0.3, rampTimeS: 1 / 40 })).toBeLessThan(1e-12);
  });

  it('when the jerk time is more than half the ramp, then it throws naming jerkTimeS', () => {
    expect(() => rampResidualVibrationMm({ frequencyHz: 40, speedMPerS: 0.3, rampTimeS: 0.01, jerkTimeS: 0.006 })).toThrow(/jerkTimeS/);
  });
});

describe('rampTimeForToleranceS', () => {
  it('when the tolerance is 0.02 mm at 40 Hz and 0.3 m/s, then no longer ramp of either shape exceeds it (independent: dense scan of the closed form)', () => {
    // Arrange
    const args = { frequencyHz: 40, speedMPerS: 0.3, toleranceMm: 0.02 };
    // Act
    const r = rampTimeForToleranceS(args);
    // Assert: beyond each time every ramp is within tolerance, and just before it some ramp is not
    let worstTrap = 0;
    let worstJerk = 0;
    for (let i = 0; i <= 20000; i++) {
      const t = r.trapezoidalS * (1 + (i / 20000) * 4);
      worstTrap = Math.max(worstTrap, rampResidualVibrationMm({ frequencyHz: 40, speedMPerS: 0.3, rampTimeS: t }));
      const tj = r.jerkLimitedS * (1 + (i / 20000) * 4);
      worstJerk = Math.max(worstJerk, rampResidualVibrationMm({ frequencyHz: 40, speedMPerS: 0.3, rampTimeS: tj, jerkTimeS: tj / 2 }));
    }
    expect(worstTrap).toBeLessThanOrEqual(0.02 + 1e-12);
    expect(worstJerk).toBeLessThanOrEqual(0.02 + 1e-12);
    expect(worstTrap).toBeGreaterThan(0.015);
    expect(r.jerkLimitedS).toBeLessThan(r.trapezoidalS);
  });

  it('when a stiffer belt doubles the frequency, then the trapezoidal ramp shrinks fourfold and the jerk-limited one 2^1.5-fold (derived)', () => {
    // Act
    const a = rampTimeForToleranceS({ frequencyHz: 30, speedMPerS: 0.4, toleranceMm: 0.01 });
    const b = rampTimeForToleranceS({ frequencyHz: 60, speedMPerS: 0.4, toleranceMm: 0.01 });
    // Assert
    expect(a.trapezoidalS / b.trapezoidalS).toBeCloseTo(4, 10);
    expect(a.jerkLimitedS / b.jerkLimitedS).toBeCloseTo(2 ** 1.5, 10);
  });

  it('when even an abrupt speed step stays within the tolerance, then both times are 0', () => {
    expect(rampTimeForToleranceS({ frequencyHz: 200, speedMPerS: 0.01, toleranceMm: 0.05 })).toEqual({ trapezoidalS: 0, jerkLimitedS: 0 });
  });
});

describe('vibrationControl', () => {
  it('when built for a 45 Hz mode at 0.3 m/s, then the section carries the shaper times and plots that start at the speed step', () => {
    // Act
    const s = vibrationControl({ frequencyHz: 45, modeId: 'belt', speedMPerS: 0.3, toleranceMm: 0.02 });
    // Assert
    expect(s.zvDurationS).toBeCloseTo(1 / 90, 12);
    expect(s.zvdDurationS).toBeCloseTo(1 / 45, 12);
    expect(s.residual.rampTimeS).toHaveLength(s.residual.trapezoidalMm.length);
    // an instantaneous speed step leaves v/ω (derived: undamped impulse response)
    expect(s.residual.trapezoidalMm[0]).toBeCloseTo((0.3 / (2 * Math.PI * 45)) * 1000, 9);
    expect(s.byFrequency.frequencyHz).toContain(45);
    expect(s.byFrequency.trapezoidalS[s.byFrequency.frequencyHz.indexOf(45)]).toBeCloseTo(s.rampTimeForTolerance.trapezoidalS, 12);
  });
});
