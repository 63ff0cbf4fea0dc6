import {
  compareMechanisms,
  EngineInputError,
  evaluateValidDesign,
  getAt,
  sweepPoint,
  type ComparisonRow,
  type DesignInput,
  type DesignResult,
  type SweepPoint,
} from '@/engine';
import { validationError } from '../errors';
import { calcJson } from '../workers/pool';
import type { CalcTask } from '../workers/tasks';

/** Body-level names the engine may report on its own (everything else is a field of the design). */
const BODY_FIELDS = new Set(['path', 'values']);

/** Engine input errors (found past the schema) become 400s naming the field: `design.<field>`, or `path` / `values`. */
function rethrowEngineError(err: unknown): never {
  if (err instanceof EngineInputError) {
    throw validationError(
      err.issues.map((i) => ({
        path: BODY_FIELDS.has(i.path) ? i.path : ['design', i.path].filter(Boolean).join('.'),
        message: i.message,
      })),
      'The design is not valid.',
    );
  }
  throw err;
}

function run<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    return rethrowEngineError(err);
  }
}

/** The full engine result for a validated design (POST /api/calc). */
export function calculate(design: DesignInput): DesignResult {
  return run(() => evaluateValidDesign(design));
}

/** The same inputs as corexy, hbot and cartesian side by side (POST /api/calc/compare). */
export function compare(design: DesignInput): { rows: ComparisonRow[] } {
  return run(() => compareMechanisms(design));
}

/**
 * Checks that `path` names an input of the design that holds a number (or a nullable number such as
 * plannedAccelMmPerS2). The validated design has every default filled in, so every known field is present.
 */
function assertSweepPath(design: DesignInput, path: string): void {
  const node = getAt(design, path);
  if (node === undefined) throw validationError([{ path: 'path', message: `"${path}" is not an input of the design` }]);
  if (node !== null && typeof node !== 'number') {
    throw validationError([{ path: 'path', message: `"${path}" is not a numeric input of the design` }]);
  }
}

/** Lets other requests run between two engine runs (each takes tens of milliseconds). */
const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Evaluates the design once per value of the input at `path` (POST /api/calc/sweep). A value the schema
 * rejects gives a point with `ok: false` and its issues instead of failing the whole sweep. The values run one
 * at a time with a pause between them, so a 50-value sweep does not hold up everyone else's requests.
 */
export async function sweepInput(
  design: DesignInput,
  path: string,
  values: number[],
  options: { yieldBetween?: boolean } = {},
): Promise<{ path: string; points: SweepPoint[] }> {
  assertSweepPath(design, path);
  const points: SweepPoint[] = [];
  for (const value of values) {
    points.push(run(() => sweepPoint(design, path, value)));
    // In a worker thread nobody else waits for this loop.
    if (options.yieldBetween !== false) await yieldToEventLoop();
  }
  return { path, points };
}

/**
 * POST /api/calc, /compare and /sweep off the event loop: the engine and the JSON encoding of its answer run in
 * the engine worker pool, and the route only writes the bytes.
 * @param task - what to compute (see server/workers/tasks.ts)
 * @returns the answer as UTF-8 JSON
 */
export function calculateJson(task: CalcTask): Promise<Buffer> {
  return calcJson(task);
}
