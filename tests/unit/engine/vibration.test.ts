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

describe('ringingAmplitudeMm', () => {
  it.each([
    // undamped spring–mass under a step of acceleration: static offset a/ω², overshoot equal (Rao ch. 4, from memory)
    [10, 50, (10 / (2 * Math.PI * 50) ** 2) * 1000],
    [-3, 100, (3 / (2 * Math.PI * 100) ** 2) * 1000],
  ])('when %d m/s² hits a %d Hz mode, then the overshoot is a/(2πf)² mm', (accelMPerS2, frequencyHz, expected) => {
    expect(ringingAmplitudeMm({ accelMPerS2, frequencyHz })).toBeCloseTo(expected, 12);
  });
});
