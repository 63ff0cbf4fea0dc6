import {
  compareMechanisms,
  defaultDesign,
  evaluateValidDesign,
  parseDesign,
  safeParseDesign,
  type ComparisonRow,
  type DesignInput,
  type DesignResult,
  type InputIssue,
} from '@/engine';

/**
 * The engine work the Design desk asks for — one evaluation, the same inputs under every mechanism, and a
 * sweep of one input — run either in the engine Web Worker or, where workers do not exist (tests), on the main
 * thread. Compare and Sweep are the engine's own `compareMechanisms` and `sweepPoint`, so the screen shows the
 * same figures as the API (docs/models/what-if.md).
 */

/** Outcome of evaluating one variant: the result, or the issues that stopped it. */
export type Outcome = { ok: true; result: DesignResult } | { ok: false; issues: InputIssue[] };

/** What to sweep: a dotted input path, its values in stored units. */
export interface SweepSpec {
  path: string;
  values: number[];
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
 * The design under every mechanism, through the engine's own comparison (the same figures as POST /api/calc/compare).
 * @param design - a design document
 * @throws EngineInputError when the design itself is invalid
 */
export function compareRows(design: Record<string, unknown>): ComparisonRow[] {
  return compareMechanisms(design).rows;
}

/**
 * A sweep's base design, validated once for all its points (each point is then the engine's `sweepPoint`, the same
 * as one value of POST /api/calc/sweep).
 * @param design - a design document
 * @throws EngineInputError when the design itself is invalid
 */
export function sweepBase(design: Record<string, unknown>): DesignInput {
  return parseDesign(design);
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
