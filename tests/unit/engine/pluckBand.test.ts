import { describe, expect, it } from 'vitest';
import { PLUCK_TENSION_TOLERANCE, pluckBandHz, spanFrequencyHz, tensionFromFrequencyN } from '@/engine';

describe('pluckBandHz', () => {
  it.each([
    // [tension N, mass kg/m, span mm]
    [40, 0.0075, 300],
    [120, 0.012, 150],
  ])(
    'when a %s N span (μ %s kg/m, %s mm) is plucked at the band edges, then the tension read back is 90 % and 110 % of the target (independent: inverse string law)',
    (tensionN, linearMassKgPerM, spanMm) => {
      // Arrange
      const targetHz = spanFrequencyHz({ tensionN, linearMassKgPerM, spanMm });
      // Act
      const { lowHz, highHz } = pluckBandHz({ targetHz });
      // Assert: read the edges back through T = 4·μ·L²·f² (Halliday, Resnick & Walker, ch. 16), not through the band's own formula
      expect(tensionFromFrequencyN({ frequencyHz: lowHz, linearMassKgPerM, spanMm })).toBeCloseTo(
        tensionN * (1 - PLUCK_TENSION_TOLERANCE),
        9,
      );
      expect(tensionFromFrequencyN({ frequencyHz: highHz, linearMassKgPerM, spanMm })).toBeCloseTo(
        tensionN * (1 + PLUCK_TENSION_TOLERANCE),
        9,
      );
    },
  );

  it('when the tolerance is ±10 % on tension, then the band is about −5.1 % / +4.9 % on frequency, narrower than on tension', () => {
    const { lowHz, highHz } = pluckBandHz({ targetHz: 100 });
    expect(lowHz).toBeGreaterThan(94.8);
    expect(lowHz).toBeLessThan(94.9);
    expect(highHz).toBeGreaterThan(104.8);
    expect(highHz).toBeLessThan(104.9);
  });
});
