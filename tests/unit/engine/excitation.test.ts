import { describe, expect, it } from 'vitest';
import { excitation, meshCrossings, stepRatesHz, toothMeshFrequencyHz } from '@/engine';

describe('toothMeshFrequencyHz', () => {
  it('when a 2 mm belt runs at 0.5 m/s, then 250 teeth per second mesh (derived: f = v/p)', () => {
    expect(toothMeshFrequencyHz({ beltSpeedMPerS: 0.5, pitchMm: 2 })).toBeCloseTo(250, 12);
  });
});

describe('stepRatesHz', () => {
  it('when the belt runs at 0.5 m/s on a 20-tooth 2 mm pulley with 1/16 microsteps, then 40 000 microsteps/s (derived: references FE-BELT)', () => {
    // full step = 40 mm / 200 = 0.2 mm
    expect(stepRatesHz({ beltSpeedMPerS: 0.5, fullStepMm: 0.2, microsteps: 16 })).toEqual({ fullStepHz: 2500, microstepHz: 40000 });
  });
});

describe('meshCrossings', () => {
  it('when a 60 Hz mode and a 100–400 Hz span band sit under a 0.5 m/s top speed on a 2 mm belt, then they cross at 0.12 m/s and 0.2–0.5 m/s', () => {
    // Act
    const c = meshCrossings({
      pitchMm: 2,
      topBeltSpeedMPerS: 0.5,
      targets: [
        { label: 'span', kind: 'span', minHz: 100, maxHz: 400 },
        { label: 'Gantry yaw', kind: 'mode', minHz: 60, maxHz: 60 },
        { label: 'too high', kind: 'mode', minHz: 900, maxHz: 900 },
      ],
    });
    // Assert
    expect(c.map((x) => x.label)).toEqual(['Gantry yaw', 'span']);
    expect(c[0].fromBeltSpeedMPerS).toBeCloseTo(0.12, 12);
    expect(c[1].fromBeltSpeedMPerS).toBeCloseTo(0.2, 12);
    expect(c[1].toBeltSpeedMPerS).toBeCloseTo(0.5, 12);
  });
});

describe('excitation', () => {
  it('when a crossed-belt stage cruises at 0.3 m/s (diagonal belt speed √2×), then the cruise figures and the step-limited speed follow', () => {
    // Act
    const e = excitation({
      pitchMm: 2,
      fullStepMm: 0.2,
      microsteps: 16,
      beltSpeedPerCarriageSpeed: Math.SQRT2,
      cruiseSpeedMPerS: 0.3,
      topBeltSpeedMPerS: 1,
      stepRateLimitHz: 100000,
      targets: [],
    });
    // Assert
    expect(e.beltSpeedAtCruiseMPerS).toBeCloseTo(0.3 * Math.SQRT2, 12);
    expect(e.toothMeshHzAtCruise).toBeCloseTo((0.3 * Math.SQRT2) / 0.002, 9);
    expect(e.microstepRateHzAtCruise).toBeCloseTo((0.3 * Math.SQRT2 * 1000 * 16) / 0.2, 6);
    expect(e.microstepRateHzAtTop).toBeCloseTo(80000, 6);
    // 100 kHz × 0.0125 mm = 1.25 m/s of belt, /√2 of carriage
    expect(e.speedAtStepLimitMPerS).toBeCloseTo(1.25 / Math.SQRT2, 12);
  });
});
