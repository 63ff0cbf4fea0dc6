/**
 * Provenance of the `independent` pull-out torque rows: the brute-force search beside the table
 * (reference/stepper-phasor-model/bruteForceSearch.ts, built from the circuit equation only, no engine code) must
 * reproduce every stored value to its 6 significant figures, so the table is what that search gives and nothing else.
 * The engine's closed form is checked against the same rows in motorTorque.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { searchInputOf, searchPullOutNm, sixFigures, type PullOutRow } from '../../../reference/stepper-phasor-model/bruteForceSearch';
import { loadReference, referenceCases } from '../../helpers/loadReference';

const table = loadReference<PullOutRow['inputs'], PullOutRow['expected']>('stepper-phasor-model', 'pull-out-torque');

describe('searchPullOutNm', () => {
  const cases = referenceCases(table);

  it.each(cases)('when %s, then the brute-force search gives the stored value', (_title, row) => {
    // Arrange
    const input = searchInputOf(row);
    // Act
    const found = sixFigures(searchPullOutNm(input));
    // Assert
    expect(found).toBe(row.expected.torqueNm);
  });

  it('when the driver is asked for no current, then there is no torque', () => {
    // Arrange: the first row's motor with a zero current setting
    const input = { ...searchInputOf(table.rows[0]), currentRmsA: 0 };
    // Act
    const found = searchPullOutNm(input);
    // Assert
    expect(found).toBe(0);
  });
});
