import { describe, expect, it } from 'vitest';
import { naturalFrequencyHz, ringingAmplitudeMm, spanStiffnessNPerM } from '@/engine';

describe('naturalFrequencyHz', () => {
  it.each([
    // S. S. Rao, Mechanical Vibrations, 5th ed., ch. 2 (from memory): SM-BASIC, SM-CARRIAGE, SM-CARRIAGE-CENTRED
    [1000, 0.25, 10.0658],
    [5e5, 0.5, 159.155],
    [3.2e5, 0.5, 127.324],
  ])('when k = %d N/m carries %d kg, then it rings at %d Hz (Rao, from memory)', (stiffnessNPerM, massKg, expected) => {
    expect(naturalFrequencyHz({ stiffnessNPerM, massKg })).toBeCloseTo(expected, 3);
  });
});

describe('spanStiffnessNPerM', () => {
  it.each([
    // Rao ch. 1 (from memory): K-SPAN, and two spans in parallel K-TWO-SPANS = 5.0e5 N/m
    [40000, 350, 114285.714],
    [40000, 100, 400000],
  ])('when EA = %d N over %d mm, then the span is %d N/m (Rao, from memory)', (axialStiffnessN, spanMm, expected) => {
    expect(spanStiffnessNPerM({ axialStiffnessN, spanMm })).toBeCloseTo(expected, 2);
  });
});

/**
 * Independent overshoot: the carriage as a mass on a spring whose drive starts accelerating at a at t = 0. The lag
 * x obeys x'' = a − ω²·x (x(0) = x'(0) = 0); integrating it with fourth-order Runge–Kutta over two periods, the
 * overshoot is the largest x minus the static lag it settles about, a/ω².
 */
function simulatedOvershootMm(accelMPerS2: number, frequencyHz: number): number {
  const w2 = (2 * Math.PI * frequencyHz) ** 2;
  const a = Math.abs(accelMPerS2);
  const f = (x: number) => a - w2 * x;
  const dt = 1 / frequencyHz / 4000;
  let x = 0;
  let v = 0;
  let peak = 0;
  for (let i = 0; i < 8000; i++) {
    const k1x = v;
    const k1v = f(x);
    const k2x = v + (dt / 2) * k1v;
    const k2v = f(x + (dt / 2) * k1x);
    const k3x = v + (dt / 2) * k2v;
    const k3v = f(x + (dt / 2) * k2x);
    const k4x = v + dt * k3v;
    const k4v = f(x + dt * k3x);
    x += (dt / 6) * (k1x + 2 * k2x + 2 * k3x + k4x);
    v += (dt / 6) * (k1v + 2 * k2v + 2 * k3v + k4v);
    peak = Math.max(peak, x);
  }
  return (peak - a / w2) * 1000;
}

describe('ringingAmplitudeMm', () => {
  it.each([
    [10, 50],
    [-3, 100],
    [25, 37],
  ])(
    'when %d m/s² hits a %d Hz mode, then the overshoot matches a time-step simulation of the spring–mass (independent)',
    (accelMPerS2, frequencyHz) => {
      // Arrange
      const expected = simulatedOvershootMm(accelMPerS2, frequencyHz);
      // Act
      const amplitude = ringingAmplitudeMm({ accelMPerS2, frequencyHz });
      // Assert
      expect(Math.abs(amplitude - expected)).toBeLessThan(1e-4 * expected);
    },
  );
});
