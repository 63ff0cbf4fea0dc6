/**
 * Stepper linear resolution on a belt axis: steps/mm = full steps × microsteps / (z·p) (common practice:
 * 80 steps/mm for 200 × 16 over 20 teeth × 2 mm). Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { stepsPerMm } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

const table = loadReference<Parameters<typeof stepsPerMm>[0], { stepsPerMm: number; microstepMm?: number }>('stepper-practice', 'steps-per-mm');

describe('stepsPerMm', () => {
  const cases = referenceCases(table);

  it.each(cases)('when %s, then the engine gives the microsteps per mm of belt', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const steps = stepsPerMm(input);
    // Assert
    expectWithinTolerance(steps, row.expected.stepsPerMm, row.tolerance, `${row.id} stepsPerMm`);
    if (row.expected.microstepMm !== undefined) expectWithinTolerance(1 / steps, row.expected.microstepMm, row.tolerance, `${row.id} microstepMm`);
  });
});
