import {
  MECHANISMS,
  defaultDesign,
  evaluateValidDesign,
  safeParseDesign,
  secondLayerFigures,
  type DesignInput,
  type DesignResult,
  type InputIssue,
  type Mechanism,
  type SecondLayerFigures,
} from '@/engine';

/**
 * The engine work the Design desk asks for — one evaluation, the same inputs under every mechanism, and a
 * sweep of one input — written once and run either in the engine Web Worker or, where workers do not
 * exist (tests), on the main thread.
 */

/** Outcome of evaluating one variant: the result, or the issues that stopped it. */
export type Outcome = { ok: true; result: DesignResult } | { ok: false; issues: InputIssue[] };

/** One column of the mechanism comparison. */
export interface CompareColumn {
  mechanism: Mechanism;
  outcome: Outcome;
}

/** What to sweep: a dotted input path, its values in stored units. */
export interface SweepSpec {
  path: string;
  values: number[];
}

/** One point of a sweep: the input value and the four figures plotted against it (null when invalid). */
export interface SweepPoint {
  value: number;
  /** Smallest pure X or Y carriage move, one microstep of belt [mm]. */
  resolutionMm: number | null;
  /** Top speed in the worst direction [m/s]. */
  speedMaxMPerS: number | null;
  /** Acceleration at rest in the worst direction [m/s²]. */
  accelMaxMPerS2: number | null;
  /** Lowest natural frequency over the travel [Hz]. */
  lowestFrequencyHz: number | null;
  /** Failed checks at this point. */
  failCount: number | null;
  /** The second layer's key numbers at this point (null when invalid). */
  second: SecondLayerFigures | null;
  /** Why the point has no numbers (invalid input). */
  problem: string | null;
}

/**
 * Evaluates a design without throwing for bad input, validating it exactly once.
 * @param design - a design document
 * @param options - `validated`: the design already passed the shared schema (the Design desk validates every
 *   change on the main thread for its field messages), so the engine runs on it without a second parse
 */
export function evaluateOutcome(design: unknown, options: { validated?: boolean } = {}): Outcome {
  let valid: DesignInput;
  if (options.validated) valid = design as DesignInput;
  else {
    const parsed = safeParseDesign(design);
    if (!parsed.ok) return { ok: false, issues: parsed.issues };
    valid = parsed.value;
  }
  try {
    return { ok: true, result: evaluateValidDesign(valid) };
  } catch (err) {
    const issues = (err as { issues?: InputIssue[] }).issues;
    if (Array.isArray(issues)) return { ok: false, issues };
    throw err;
  }
}

/**
 * The same inputs under another mechanism: a second Y motor exists only on the cartesian stage.
 * @param design - a design document
 * @param mechanism - the mechanism wanted
 */
export function withMechanism(design: Record<string, unknown>, mechanism: Mechanism): Record<string, unknown> {
  const copy: Record<string, unknown> = { ...design, mechanism };
  if (mechanism !== 'cartesian') copy.yMotors = 1;
  return copy;
}

/**
 * Evaluates a design under every mechanism.
 * @param design - a design document
 */
export function compareOutcomes(design: Record<string, unknown>): CompareColumn[] {
  return MECHANISMS.map((mechanism) => ({ mechanism, outcome: evaluateOutcome(withMechanism(design, mechanism)) }));
}

/**
 * Sets a value at a dotted path in a deep copy of an object.
 * @param source - object to copy
 * @param path - e.g. "pulley.driveTeeth"
 * @param value - the value to put there
 */
export function withValueAt(source: Record<string, unknown>, path: string, value: unknown): Record<string, unknown> {
  const copy = structuredClone(source);
  const keys = path.split('.');
  let node: Record<string, unknown> = copy;
  for (const key of keys.slice(0, -1)) {
    if (typeof node[key] !== 'object' || node[key] === null) node[key] = {};
    node = node[key] as Record<string, unknown>;
  }
  node[keys[keys.length - 1]] = value;
  return copy;
}

/**
 * Evaluates one sweep point.
 * @param design - the base design
 * @param path - input to vary
 * @param value - its value at this point (stored units)
 */
export function sweepPoint(design: Record<string, unknown>, path: string, value: number): SweepPoint {
  const outcome = evaluateOutcome(withValueAt(design, path, value));
  if (!outcome.ok) {
    const first = outcome.issues[0];
    return {
      value,
      resolutionMm: null,
      speedMaxMPerS: null,
      accelMaxMPerS2: null,
      lowestFrequencyHz: null,
      failCount: null,
      second: null,
      problem: first ? `${first.path ? `${first.path}: ` : ''}${first.message}` : 'invalid input',
    };
  }
  const r = outcome.result;
  return {
    value,
    resolutionMm: r.drive.microstep.axisMm,
    speedMaxMPerS: r.envelope.axes.worst.speedMaxMPerS,
    accelMaxMPerS2: r.envelope.axes.worst.accelMaxMPerS2,
    lowestFrequencyHz: r.stiffness.min.frequencyHz,
    failCount: r.checks.filter((c) => c.severity === 'fail').length,
    second: secondLayerFigures(r),
    problem: null,
  };
}

/**
 * Runs the engine a few times on a template design, so that its code is loaded and compiled before the first
 * real edit (the first evaluation of a cold worker takes 50–180 ms, a warm one a few).
 * @param rounds - evaluations to run
 */
export function warmEngine(rounds = 4): void {
  const parsed = safeParseDesign(defaultDesign('corexy'));
  if (!parsed.ok) return;
  for (let i = 0; i < rounds; i++) evaluateValidDesign(parsed.value);
}
