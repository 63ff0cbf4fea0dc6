/**
 * Trapezoidal and triangular point-to-point move time (elementary constant-acceleration kinematics, derived).
 * Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { moveTimeS } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

const table = loadReference<Parameters<typeof moveTimeS>[0], { timeS: number }>('elementary-kinematics', 'move-time');

describe('moveTimeS', () => {
  const cases = referenceCases(table);

  it.each(cases)('when %s, then the move takes the collected time', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const timeS = moveTimeS(input);
    // Assert
    expectWithinTolerance(timeS, row.expected.timeS, row.tolerance, `${row.id} timeS`);
  });
});
