/**
 * The open crossed-belt relation (CoreXY, 2012): ΔA = ΔX + ΔY, ΔB = ΔX − ΔY and its inverse; one motor alone
 * moves the carriage along a 45° diagonal; the H-bot uses the same relation; forces by virtual work (derived).
 * Sign convention: the engine's default, A = X + Y, B = X − Y. Provenance: reference/README.md.
 */
import { describe, it } from 'vitest';
import { beltPullsToForce, carriageToMotor, motorToCarriage } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases } from '../../helpers/loadReference';

type Mechanism = Parameters<typeof carriageToMotor>[0]['mechanism'];

const forward = loadReference<Parameters<typeof motorToCarriage>[0], { dxMm: number; dyMm: number; travelMm: number; directionDeg: number }>(
  'corexy-2012',
  'motor-to-carriage',
);
const inverse = loadReference<Parameters<typeof carriageToMotor>[0], { daMm: number; dbMm: number }>('corexy-2012', 'carriage-to-motor');
const forces = loadReference<{ forceAN: number; forceBN: number }, { forceXN: number; forceYN: number }>('corexy-2012', 'force-relation');

/** The same case with the mechanism switched to the H-bot, which shares the crossed-belt relation. */
function asHbot<R extends { inputs: { mechanism: Mechanism } }>([title, row]: [string, R]): [string, R] {
  return [title, { ...row, inputs: { ...row.inputs, mechanism: 'hbot' } }];
}

describe('motorToCarriage', () => {
  const cases = referenceCases(forward);
  const corexyAsHbot = cases.filter(([, row]) => row.inputs.mechanism === 'corexy').map(asHbot);

  it.each(cases)('when %s, then the carriage moves by the published ΔX, ΔY in the published direction', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const { dxMm, dyMm } = motorToCarriage(input);
    // Assert
    expectWithinTolerance(dxMm, row.expected.dxMm, row.tolerance, `${row.id} dxMm`);
    expectWithinTolerance(dyMm, row.expected.dyMm, row.tolerance, `${row.id} dyMm`);
    expectWithinTolerance(Math.hypot(dxMm, dyMm), row.expected.travelMm, row.tolerance, `${row.id} travelMm`);
    expectWithinTolerance((Math.atan2(dyMm, dxMm) * 180) / Math.PI, row.expected.directionDeg, row.tolerance, `${row.id} directionDeg`);
  });

  it.each(corexyAsHbot)('when %s is run as an H-bot, then the H-bot moves the same way (same relation)', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const { dxMm, dyMm } = motorToCarriage(input);
    // Assert
    expectWithinTolerance(dxMm, row.expected.dxMm, row.tolerance, `${row.id} (hbot) dxMm`);
    expectWithinTolerance(dyMm, row.expected.dyMm, row.tolerance, `${row.id} (hbot) dyMm`);
  });

  it.each(cases)('when %s is sent back through carriageToMotor, then the motor moves return', (_title, row) => {
    // Arrange
    const { mechanism, daMm, dbMm } = row.inputs;
    // Act
    const back = carriageToMotor({ mechanism, ...motorToCarriage(row.inputs) });
    // Assert
    expectWithinTolerance(back.daMm, daMm, { rel: 1e-12, abs: 1e-12 }, `${row.id} round trip daMm`);
    expectWithinTolerance(back.dbMm, dbMm, { rel: 1e-12, abs: 1e-12 }, `${row.id} round trip dbMm`);
  });
});

describe('carriageToMotor', () => {
  const cases = referenceCases(inverse);
  const corexyAsHbot = cases.filter(([, row]) => row.inputs.mechanism === 'corexy').map(asHbot);

  it.each(cases)('when %s, then the motors need the published belt travel', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const { daMm, dbMm } = carriageToMotor(input);
    // Assert
    expectWithinTolerance(daMm, row.expected.daMm, row.tolerance, `${row.id} daMm`);
    expectWithinTolerance(dbMm, row.expected.dbMm, row.tolerance, `${row.id} dbMm`);
  });

  it.each(corexyAsHbot)('when %s is run as an H-bot, then the H-bot needs the same belt travel (same relation)', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const { daMm, dbMm } = carriageToMotor(input);
    // Assert
    expectWithinTolerance(daMm, row.expected.daMm, row.tolerance, `${row.id} (hbot) daMm`);
    expectWithinTolerance(dbMm, row.expected.dbMm, row.tolerance, `${row.id} (hbot) dbMm`);
  });
});

describe('belt pulls to carriage force (virtual work on carriageToMotor)', () => {
  const cases = referenceCases(forces);

  it.each(cases)('when %s, then [Fx, Fy] = Kᵀ·[FA, FB] with K from the engine matches', (_title, row) => {
    // Arrange: columns of K are the motor belt travel per mm of X and of Y.
    const mechanism = row.mechanism as Mechanism;
    const perX = carriageToMotor({ mechanism, dxMm: 1, dyMm: 0 });
    const perY = carriageToMotor({ mechanism, dxMm: 0, dyMm: 1 });
    const { forceAN, forceBN } = row.inputs;
    // Act
    const forceXN = perX.daMm * forceAN + perX.dbMm * forceBN;
    const forceYN = perY.daMm * forceAN + perY.dbMm * forceBN;
    // Assert
    expectWithinTolerance(forceXN, row.expected.forceXN, row.tolerance, `${row.id} forceXN`);
    expectWithinTolerance(forceYN, row.expected.forceYN, row.tolerance, `${row.id} forceYN`);
  });

  it.each(cases)('when %s, then beltPullsToForce gives the same carriage force', (_title, row) => {
    // Arrange
    const mechanism = row.mechanism as Mechanism;
    // Act
    const { forceXN, forceYN } = beltPullsToForce({ mechanism, ...row.inputs });
    // Assert
    expectWithinTolerance(forceXN, row.expected.forceXN, row.tolerance, `${row.id} beltPullsToForce forceXN`);
    expectWithinTolerance(forceYN, row.expected.forceYN, row.tolerance, `${row.id} beltPullsToForce forceYN`);
  });
});
