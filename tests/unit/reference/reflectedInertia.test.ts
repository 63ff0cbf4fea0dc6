/**
 * Reflected rotor inertia as belt-line mass, m_eq = J/r² (Design World "Linear Motion Tips"), and the
 * per-axis sum for crossed belts (derived by kinetic energy). Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { carriageToMotor, pitchDiameterMm, reflectedMassKg } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

type Mechanism = Parameters<typeof carriageToMotor>[0]['mechanism'];

const table = loadReference<Parameters<typeof reflectedMassKg>[0], { massKg?: number; pitchRadiusMm?: number; axisMassKg?: number }>(
  'linear-motion-tips',
  'reflected-inertia',
);

/** Motor belt travel per mm of carriage travel along X and along Y (columns of K). */
function motorRatesPerMm(mechanism: Mechanism): { x: number[]; y: number[] } {
  const x = carriageToMotor({ mechanism, dxMm: 1, dyMm: 0 });
  const y = carriageToMotor({ mechanism, dxMm: 0, dyMm: 1 });
  return { x: [x.daMm, x.dbMm], y: [y.daMm, y.dbMm] };
}

describe('reflectedMassKg', () => {
  const single = referenceCases(table, table.rows.filter((row) => row.expected.massKg !== undefined));

  it.each(single)('when %s, then m_eq = J/r² and r = d/2 match', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const massKg = reflectedMassKg(input);
    const radiusMm = pitchDiameterMm({ teeth: input.teeth, pitchMm: input.pitchMm }) / 2;
    // Assert
    expectWithinTolerance(massKg, row.expected.massKg as number, row.tolerance, `${row.id} massKg`);
    if (row.expected.pitchRadiusMm !== undefined) expectWithinTolerance(radiusMm, row.expected.pitchRadiusMm, row.tolerance, `${row.id} pitchRadiusMm`);
  });

  const perAxis = referenceCases(table, table.rows.filter((row) => row.expected.axisMassKg !== undefined));

  it.each(perAxis)('when %s, then Σ m_eq·(∂motor/∂axis)² is the per-axis reflected mass along X and along Y', (_title, row) => {
    // Arrange
    const mechanism = row.mechanism as Mechanism;
    const rates = motorRatesPerMm(mechanism);
    // Act
    const perMotorKg = reflectedMassKg(row.inputs);
    const xKg = rates.x.reduce((sum, rate) => sum + perMotorKg * rate * rate, 0);
    const yKg = rates.y.reduce((sum, rate) => sum + perMotorKg * rate * rate, 0);
    // Assert
    expectWithinTolerance(xKg, row.expected.axisMassKg as number, row.tolerance, `${row.id} X axis`);
    expectWithinTolerance(yKg, row.expected.axisMassKg as number, row.tolerance, `${row.id} Y axis`);
  });
});
