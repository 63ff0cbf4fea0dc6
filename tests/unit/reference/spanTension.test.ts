/**
 * Transverse vibration of a taut belt span (Mersenne's laws; Halliday, Resnick & Walker Ch. 16) in both
 * directions: pluck frequency from tension and tension from a measured frequency. Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { spanFrequencyHz, tensionFromFrequencyN } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

const frequencyTable = loadReference<
  Parameters<typeof spanFrequencyHz>[0],
  { frequencyHz: number; waveSpeedMPerS?: number; secondHarmonicHz?: number }
>('halliday-resnick-walker', 'span-frequency');
const tensionTable = loadReference<Parameters<typeof tensionFromFrequencyN>[0], { tensionN: number }>('halliday-resnick-walker', 'span-tension');

describe('spanFrequencyHz', () => {
  const cases = referenceCases(frequencyTable);

  it.each(cases)('when %s, then the fundamental (and the quantities that follow from it) match', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const f1 = spanFrequencyHz(input);
    // Assert
    expectWithinTolerance(f1, row.expected.frequencyHz, row.tolerance, `${row.id} frequencyHz`);
    if (row.expected.waveSpeedMPerS !== undefined) {
      expectWithinTolerance(2 * (row.inputs.spanMm / 1000) * f1, row.expected.waveSpeedMPerS, row.tolerance, `${row.id} v = 2·L·f₁`);
    }
    if (row.expected.secondHarmonicHz !== undefined) {
      expectWithinTolerance(2 * f1, row.expected.secondHarmonicHz, row.tolerance, `${row.id} f₂ = 2·f₁`);
    }
  });

  it.each(cases)('when %s is read back through tensionFromFrequencyN, then the input tension returns', (_title, row) => {
    // Arrange
    const { tensionN, linearMassKgPerM, spanMm } = row.inputs;
    // Act
    const back = tensionFromFrequencyN({ frequencyHz: spanFrequencyHz(row.inputs), linearMassKgPerM, spanMm });
    // Assert
    expectWithinTolerance(back, tensionN, { rel: 1e-12 }, `${row.id} round trip`);
  });
});

describe('tensionFromFrequencyN', () => {
  const cases = referenceCases(tensionTable);

  it.each(cases)('when %s, then T = 4·μ·L²·f² matches', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const tensionN = tensionFromFrequencyN(input);
    // Assert
    expectWithinTolerance(tensionN, row.expected.tensionN, row.tolerance, `${row.id} tensionN`);
  });
});
