import type { InputIssue } from './errors';
import { evaluateValidDesign } from './evaluateDesign';
import { MECHANISMS } from './kinematics';
import { parseDesign, safeParseDesign, type DesignInput } from './schema';
import type { ModeId } from './structuralModes';
import type { DesignResult, Mechanism } from './types';

/** Key numbers of one design, side by side with others. */
export interface KeyFigures {
  travelXMm: number;
  travelYMm: number;
  stepsPerMm: number;
  /** Carriage figures of one microstep (docs/models/resolution.md). */
  microstep: { oneMotorMm: number; oneMotorDirectionDeg: number; axisMm: number; diagonalMm: number };
  /** Acceleration at rest along X, Y, the diagonal and in the worst direction (the lowest over all directions) [m/s²]. */
  accelMaxMPerS2: { x: number; y: number; diagonal: number; worst: number };
  /**
   * Top speed along X, Y, the diagonal and in the worst direction: the lowest top speed over all directions, the
   * speed the stage reaches whichever way it moves (docs/models/envelope.md §3) [m/s].
   */
  speedMaxMPerS: { x: number; y: number; diagonal: number; worst: number };
  lowestFrequencyHz: number;
  /** Ringing amplitude after an abrupt change of the worst-direction acceleration [mm]. */
  ringingWorstMm: number;
  movingMassKg: { x: number; y: number };
  rackingMomentPerNewtonM: number;
  /** Peak racking moment on the gantry [N·m]. */
  rackingPeakMomentNm: number;
  /** Belt to cut, all loops together [mm]. */
  beltCutMm: number;
  motorCount: number;
  warnCount: number;
  failCount: number;
  /** Second-layer figures (docs/models/). */
  secondLayer: SecondLayerFigures;
}

/** The second layer's key numbers, for comparing mechanisms and sweeping an input. */
export interface SecondLayerFigures {
  /** Worst positioning error over the travel [mm]. */
  errorTotalMm: number;
  /** Lowest of all modes and which one [Hz]. */
  lowestModeHz: number;
  lowestModeId: ModeId;
  /** Move time the ZV shaper adds [s]. */
  zvShaperS: number;
  /** Shortest constant-acceleration ramp to cruise within the ringing tolerance [s]. */
  rampTimeS: number;
  /** Microstep rate of the fastest motor at cruise [Hz]. */
  microstepRateHz: number;
  /** Copper loss of all motors [W]. */
  copperLossW: number;
  /** Supply power with margin [W]. */
  supplyPowerW: number;
  /** Largest radial load on a motor shaft at peak pull [N]. */
  motorShaftLoadN: number;
  /** Job cycle time at the plan (null without a job, or when some move cannot be made) [s]. */
  jobTotalS: number | null;
  /** Job cycle time as fast as the motors allow [s]. */
  jobAtLimitsS: number | null;
  /** Moving time of that job, dwells left out [s]. */
  jobAtLimitsMoveS: number | null;
}

/**
 * The second layer's key numbers of a result.
 * @param r - an evaluateDesign result
 * @returns error [mm], lowest mode [Hz], shaper and ramp times [s], step rate [Hz], powers [W], shaft load [N], job [s]
 */
export function secondLayerFigures(r: DesignResult): SecondLayerFigures {
  return {
    errorTotalMm: r.errorBudget.worst.totalMm,
    lowestModeHz: r.stiffness.lowest.frequencyHz,
    lowestModeId: r.stiffness.lowest.modeId,
    zvShaperS: r.shaping.zvDurationS,
    rampTimeS: r.shaping.rampTimeForTolerance.trapezoidalS,
    microstepRateHz: r.excitation.microstepRateHzAtCruise,
    copperLossW: r.heat.totalCopperLossW,
    supplyPowerW: r.heat.supply.powerW,
    motorShaftLoadN: r.loads.motorShaftRadialN.atPeak,
    jobTotalS: r.job ? r.job.totalS : null,
    jobAtLimitsS: r.job?.atLimits ? r.job.atLimits.totalS : null,
    jobAtLimitsMoveS: r.job?.atLimits ? r.job.atLimits.moveS : null,
  };
}

/** Acceleration at rest over all directions, for overlaying the mechanisms' envelopes. */
export interface AccelEnvelope {
  directionsDeg: number[];
  /** [m/s²] */
  accelMaxMPerS2: number[];
}

/** One mechanism's row of a comparison. */
export type ComparisonRow =
  | ({ mechanism: Mechanism; ok: true; accelEnvelope: AccelEnvelope } & KeyFigures)
  | { mechanism: Mechanism; ok: false; issues: InputIssue[] };

/**
 * Extracts the key figures of a result (shared by the comparison and the sweep).
 * @param r - an evaluateDesign result
 * @returns travel [mm], resolution [steps/mm, mm], limits [m/s², m/s], lowest resonance [Hz], masses [kg], counts
 */
export function keyFigures(r: DesignResult): KeyFigures {
  const a = r.envelope.axes;
  return {
    travelXMm: r.travel.xMm,
    travelYMm: r.travel.yMm,
    stepsPerMm: r.drive.stepsPerMm,
    microstep: { ...r.drive.microstep },
    accelMaxMPerS2: { x: a.x.accelMaxMPerS2, y: a.y.accelMaxMPerS2, diagonal: a.diagonal.accelMaxMPerS2, worst: a.worst.accelMaxMPerS2 },
    speedMaxMPerS: {
      x: a.x.speedMaxMPerS,
      y: a.y.speedMaxMPerS,
      diagonal: a.diagonal.speedMaxMPerS,
      worst: a.slowest.speedMaxMPerS,
    },
    lowestFrequencyHz: r.stiffness.min.frequencyHz,
    ringingWorstMm: r.stiffness.ringing.worst.amplitudeMm,
    movingMassKg: { x: r.mass.xKg, y: r.mass.yKg },
    rackingMomentPerNewtonM: r.racking.momentPerNewtonM,
    rackingPeakMomentNm: r.racking.peakMomentNm,
    beltCutMm: r.belts.reduce((s, b) => s + b.cutLengthMm, 0),
    motorCount: r.motors.reduce((s, m) => s + m.count, 0),
    warnCount: r.checks.filter((c) => c.severity === 'warn').length,
    failCount: r.checks.filter((c) => c.severity === 'fail').length,
    secondLayer: secondLayerFigures(r),
  };
}

/**
 * Evaluates the same design as corexy, hbot and cartesian and returns the key numbers side by side. A cartesian
 * design's two Y motors become one when it is turned into a crossed-belt design (crossed belts have two motors).
 * @param input - a design document (validated first)
 * @returns one row per mechanism; a mechanism the frame cannot take gives a row with its issues
 * @throws EngineInputError when the design itself is invalid
 */
export function compareMechanisms(input: unknown): { rows: ComparisonRow[] } {
  const base = parseDesign(input);
  return { rows: MECHANISMS.map((mechanism) => comparisonRow(base, mechanism)) };
}

/**
 * One mechanism's row of a comparison: the same inputs under that mechanism, evaluated.
 * @param base - a validated design (parseDesign)
 * @param mechanism - the mechanism to evaluate it as
 * @returns the key figures and the acceleration envelope, or the issues that keep the frame from taking it
 */
export function comparisonRow(base: DesignInput, mechanism: Mechanism): ComparisonRow {
  const variant = { ...base, mechanism, yMotors: mechanism === 'cartesian' ? base.yMotors : 1 };
  const parsed = safeParseDesign(variant);
  if (!parsed.ok) return { mechanism, ok: false as const, issues: parsed.issues };
  const r = evaluateValidDesign(parsed.value);
  const accelEnvelope = { directionsDeg: r.envelope.directionsDeg, accelMaxMPerS2: r.envelope.accelMaxMPerS2 };
  return { mechanism, ok: true as const, accelEnvelope, ...keyFigures(r) };
}
