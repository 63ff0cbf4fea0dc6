/**
 * Free-load-angle pull-out torque of a two-phase hybrid stepper (model from memory; docs/models/motor-torque.md) against
 * values from an independent brute-force search over the supply-voltage phasor (bruteForceSearch.ts beside the
 * table). The older scalar model's torques serve as a lower bound. Provenance: reference/README.md.
 */
import { describe, expect, it } from 'vitest';
import { motorTorqueNm, pullOutTorqueNm } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

type MotorTorqueInputs = Parameters<typeof motorTorqueNm>[0];

const pullOut = loadReference<MotorTorqueInputs, { torqueNm: number }>('stepper-phasor-model', 'pull-out-torque');
const scalar = loadReference<MotorTorqueInputs, { torqueNm: number }>('stepper-phasor-model', 'scalar-model-bound');

/** Current-limited torque k_t·√2·min(I_rms, I_rated) of the rows' motor and driver [N·m] (the standstill torque). */
function clipTorqueNm({ motor, driver }: MotorTorqueInputs): number {
  const ktNmPerA = motor.holdingTorqueNm / (Math.SQRT2 * motor.ratedCurrentA);
  return ktNmPerA * Math.SQRT2 * Math.min(driver.currentRmsA, motor.ratedCurrentA);
}

describe('pullOutTorqueNm', () => {
  const cases = referenceCases(pullOut);

  it.each(cases)('when %s, then the closed form matches the brute-force search', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const torqueNm = pullOutTorqueNm(input);
    // Assert: a grid search only reaches the optimum from below (the stored value is rounded to 6 s.f.)
    expect(torqueNm).toBeGreaterThanOrEqual(row.expected.torqueNm * (1 - 5e-6));
    expectWithinTolerance(torqueNm, row.expected.torqueNm, row.tolerance, `${row.id} torqueNm at ${input.speedRevPerS} rev/s`);
  });
});

describe('motorTorqueNm', () => {

  const bounds = referenceCases(scalar);

  it.each(bounds)('when %s, then the engine\'s torque lies between the scalar-model torque and the standstill torque', (_title, row) => {
    // Arrange
    const input = row.inputs;
    const lowerNm = row.expected.torqueNm * (1 - (row.tolerance?.rel ?? 0));
    const upperNm = clipTorqueNm(input) * (1 + 1e-12);
    // Act
    const torqueNm = motorTorqueNm(input);
    // Assert
    expect(torqueNm, `${row.id}: below the scalar model's ${row.expected.torqueNm} N·m`).toBeGreaterThanOrEqual(lowerNm);
    expect(torqueNm, `${row.id}: above the current-limited ${upperNm} N·m`).toBeLessThanOrEqual(upperNm);
  });
});
