/**
 * H-bot racking moment M = Fx·S/2 and its guide reaction R = M/b, from the free-body derivation in
 * reference/racking/hbot-racking.md (derived); zero for symmetric crossed belts and for cartesian stages.
 */
import { describe, expect, it } from 'vitest';
import { evaluateDesign, guideReactionN, rackingMomentPerNewtonM } from '@/engine';
import { expectWithinTolerance, loadReference, referenceCases, sourceLabel } from '../../helpers/loadReference';

const momentTable = loadReference<Parameters<typeof rackingMomentPerNewtonM>[0], { momentPerNewtonM: number }>('racking', 'moment-per-newton');
const reactionTable = loadReference<Parameters<typeof guideReactionN>[0], { guideReactionN: number }>('racking', 'guide-reaction');
const SRC = sourceLabel(momentTable);

/** The example design of src/engine/README.md (invented demo numbers), with the mechanism and frame width varied below. */
const EXAMPLE_DESIGN = {
  schemaVersion: 1,
  name: 'Bench dispensing stage',
  mechanism: 'hbot',
  frame: { outerXMm: 460, outerYMm: 460, extrusionMm: 20, carriageXMm: 60, carriageYMm: 50, gantryYMm: 40, clearanceMm: 5 },
  belt: { pitchMm: 2, widthMm: 6, linearMassKgPerM: 0.0075, axialStiffnessN: 40000, allowableTensionN: 250, minPulleyTeeth: 12 },
  pulley: { driveTeeth: 20, idlerTeeth: 20 },
  motor: {
    stepAngleDeg: 1.8, holdingTorqueNm: 0.45, ratedCurrentA: 1.5, phaseResistanceOhm: 1.8, phaseInductanceMh: 3.2,
    rotorInertiaKgM2: 5.7e-6, massKg: 0.28, torqueCurve: null,
  },
  driver: { microsteps: 16, supplyV: 24, currentRmsA: 1.2 },
  masses: { carriageKg: 0.3, toolKg: 0.1, gantryKg: 0.45 },
  frictionN: { x: 2, y: 3 },
  pretensionN: 40,
  torqueMargin: 0.6,
  cruiseSpeedMmPerS: 300,
  toolMount: { holdN: 25 },
  map: { points: 41 },
  ringingToleranceMm: 0.02,
} as const;

function racking(mechanism: 'corexy' | 'hbot' | 'cartesian', outerXMm: number = EXAMPLE_DESIGN.frame.outerXMm): ReturnType<typeof evaluateDesign>['racking'] {
  return evaluateDesign({ ...EXAMPLE_DESIGN, mechanism, frame: { ...EXAMPLE_DESIGN.frame, outerXMm } }).racking;
}

describe('rackingMomentPerNewtonM', () => {
  const cases = referenceCases(momentTable);

  it.each(cases)('when %s, then the moment per newton of X pull matches the free body', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const perNewtonM = rackingMomentPerNewtonM(input);
    // Assert
    expectWithinTolerance(Math.abs(perNewtonM), row.expected.momentPerNewtonM, row.tolerance, `${row.id} momentPerNewtonM`);
  });
});

describe('guideReactionN', () => {
  const cases = referenceCases(reactionTable);

  it.each(cases)('when %s, then one guide holds the moment with R = M/b', (_title, row) => {
    // Arrange
    const input = row.inputs;
    // Act
    const reactionN = guideReactionN(input);
    // Assert
    expectWithinTolerance(reactionN, row.expected.guideReactionN, row.tolerance, `${row.id} guideReactionN`);
  });
});

describe('evaluateDesign racking', () => {
  it(`when the example design is an H-bot (${SRC}), then M per newton is half the reported turn spacing and R = M/b`, () => {
    // Arrange / Act
    const r = racking('hbot');
    // Assert
    expect(r.turnSpacingMm).toBeGreaterThan(0);
    expect(r.turnSpacingMm).toBeLessThan(EXAMPLE_DESIGN.frame.outerXMm - 2 * EXAMPLE_DESIGN.frame.extrusionMm);
    expectWithinTolerance(Math.abs(r.momentPerNewtonM), r.turnSpacingMm / 2 / 1000, { rel: 1e-12 }, 'M/Fx = S/2');
    expectWithinTolerance(Math.abs(r.peakMomentNm), Math.abs(r.momentPerNewtonM) * Math.abs(r.peakForceXN), { rel: 1e-12 }, 'M = Fx·S/2');
    expectWithinTolerance(r.guideReactionN, Math.abs(r.peakMomentNm) / (r.guideSpanMm / 1000), { rel: 1e-12 }, 'R = M/b');
  });

  it(`when the H-bot frame is widened by 100 mm (${SRC}), then M per newton grows by 0.05 m because the turns follow the frame sides`, () => {
    // Arrange
    const narrow = racking('hbot', 460);
    // Act
    const wide = racking('hbot', 560);
    // Assert: S grows with the frame width, M/Fx = S/2.
    expectWithinTolerance(Math.abs(wide.momentPerNewtonM) - Math.abs(narrow.momentPerNewtonM), 0.05, { rel: 1e-9 }, 'Δ(M/Fx)');
  });

  it.each(['corexy', 'cartesian'] as const)(`when the example design is %s (${SRC}), then no racking moment and no guide reaction`, (mechanism) => {
    // Arrange / Act
    const r = racking(mechanism);
    // Assert
    expect(r.momentPerNewtonM).toBe(0);
    expect(r.peakMomentNm).toBe(0);
    expect(r.guideReactionN).toBe(0);
    expect(r.peakForceXN).toBeGreaterThan(0);
  });
});
