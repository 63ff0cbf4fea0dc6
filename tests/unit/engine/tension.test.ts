import { describe, expect, it } from 'vitest';
import { spanFrequencyHz, tensionFromFrequencyN } from '@/engine';

describe('spanFrequencyHz', () => {
  it.each([
    // Halliday, Resnick & Walker, Fundamentals of Physics, ch. 16 (f = v/2L, v = √(T/μ)): STR-F-FROM-T
    [20, 0.0075, 350, 73.7711],
    [33.166875, 0.0075, 350, 95],
  ])('when T = %d N, μ = %d kg/m, L = %d mm, then the span sounds at %d Hz (Halliday)', (tensionN, linearMassKgPerM, spanMm, expected) => {
    expect(spanFrequencyHz({ tensionN, linearMassKgPerM, spanMm })).toBeCloseTo(expected, 3);
  });
});

describe('tensionFromFrequencyN', () => {
  it('when a 350 mm span of 0.0075 kg/m sounds at 95 Hz, then it carries 33.1669 N (Halliday, STR-T-FROM-F)', () => {
    expect(tensionFromFrequencyN({ frequencyHz: 95, linearMassKgPerM: 0.0075, spanMm: 350 })).toBeCloseTo(33.1669, 3);
  });

  it.each([
    [10, 0.0075, 120],
    [55, 0.011, 410],
  ])('when %d N is turned into a frequency and back, then it returns (inverse pair)', (t, mu, l) => {
    const f = spanFrequencyHz({ tensionN: t, linearMassKgPerM: mu, spanMm: l });
    expect(tensionFromFrequencyN({ frequencyHz: f, linearMassKgPerM: mu, spanMm: l })).toBeCloseTo(t, 9);
  });
});
