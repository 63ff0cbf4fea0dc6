/**
 * Spring–mass natural frequency, span stiffness EA/L and two spans in parallel (S. S. Rao, Mechanical
 * Vibrations, 5th ed. — from memory). Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { naturalFrequencyHz, spanStiffnessNPerM } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

const frequencyTable = loadReference<Parameters<typeof naturalFrequencyHz>[0], { frequencyHz: number }>('rao-mechanical-vibrations', 'natural-frequency');
const stiffnessTable = loadReference<
  { axialStiffnessN: number; spanMm?: number; span1Mm?: number; span2Mm?: number; massKg?: number },
  { stiffnessNPerM: number; frequencyHz?: number }
>('rao-mechanical-vibrations', 'span-stiffness');

/** Spans holding the carriage act as springs in parallel: k = Σ EA/Lᵢ, each EA/Lᵢ from the engine [N/m]. */
function spansStiffnessNPerM(axialStiffnessN: number, spansMm: number[]): number {
  return spansMm.reduce((k, spanMm) => k + spanStiffnessNPerM({ axialStiffnessN, spanMm }), 0);
}

describe('naturalFrequencyHz', () => {
  const cases = referenceCases(frequencyTable);

  it.each(cases)('when %s, then f = (1/2π)·√(k/m) matches', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const frequencyHz = naturalFrequencyHz(input);
    // Assert
    expectWithinTolerance(frequencyHz, row.expected.frequencyHz, row.tolerance, `${row.id} frequencyHz`);
  });
});

describe('span stiffness EA/L into naturalFrequencyHz', () => {
  const cases = referenceCases(stiffnessTable);

  it.each(cases)('when %s, then engine EA/L spans summed in parallel gives the stiffness and the engine the frequency of the held mass', (_title, row) => {
    // Arrange
    const { axialStiffnessN, spanMm, span1Mm, span2Mm, massKg } = row.inputs;
    const spans = [spanMm, span1Mm, span2Mm].filter((l): l is number => l !== undefined);
    // Act
    const stiffnessNPerM = spansStiffnessNPerM(axialStiffnessN, spans);
    // Assert: EA/L per span, added in parallel (docs/models/stiffness-and-ringing.md), reproduces the collected stiffness …
    expectWithinTolerance(stiffnessNPerM, row.expected.stiffnessNPerM, row.tolerance, `${row.id} stiffnessNPerM`);
    // … and, where the case holds a mass, the engine turns that stiffness into the collected frequency.
    if (row.expected.frequencyHz !== undefined && massKg !== undefined) {
      const frequencyHz = naturalFrequencyHz({ stiffnessNPerM, massKg });
      expectWithinTolerance(frequencyHz, row.expected.frequencyHz, row.tolerance, `${row.id} frequencyHz`);
    }
  });
});
