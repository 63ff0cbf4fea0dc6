/**
 * Hybrid stepper torque–speed, phasor model (from memory; illustrative inputs R = 1.65 Ω, L = 2.8 mH,
 * k_t = k_e = 0.25 N·m/A, V = 24 V, I_set = 1.5 A, N_r = 50), through motorTorqueNm with motor and driver data
 * chosen to reproduce those constants under the engine's conventions (engine.md §5; derivation in each row note).
 * The scalar model's torques serve as a lower bound. Provenance: reference/README.md.
 */
import { describe, expect, it } from 'vitest';
import { motorTorqueNm } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

type MotorTorqueInputs = Parameters<typeof motorTorqueNm>[0];

const phasor = loadReference<MotorTorqueInputs, { torqueNm: number }>('stepper-phasor-model', 'phasor-torque');
const scalar = loadReference<MotorTorqueInputs, { torqueNm: number }>('stepper-phasor-model', 'scalar-model-bound');

/** Current-limited torque k_t·√2·I_rms of the rows' motor and driver [N·m]. */
function clipTorqueNm({ motor, driver }: MotorTorqueInputs): number {
  const ktNmPerA = motor.holdingTorqueNm / (Math.SQRT2 * motor.ratedCurrentA);
  return ktNmPerA * Math.SQRT2 * driver.currentRmsA;
}

describe('motorTorqueNm', () => {
  const cases = referenceCases(phasor);

  it.each(cases)('when %s, then the available torque (no margin) matches the phasor model', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const torqueNm = motorTorqueNm(input);
    // Assert
    expectWithinTolerance(torqueNm, row.expected.torqueNm, row.tolerance, `${row.id} torqueNm at ${input.speedRevPerS} rev/s`);
  });

  const bounds = referenceCases(scalar);

  it.each(bounds)('when %s, then the engine\'s torque lies between the scalar-model torque and the current-limited torque', (_title, row) => {
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
