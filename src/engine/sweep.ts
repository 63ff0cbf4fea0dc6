import { EngineInputError } from './errors';
import type { InputIssue } from './errors';
import { keyFigures, type KeyFigures } from './compareMechanisms';
import { nonGroupStep, setAt } from './dottedPath';
import { evaluateValidDesign } from './evaluateDesign';
import { parseDesign, safeParseDesign } from './schema';
import type { DesignInput } from './schema';

/** One value of a sweep. */
export type SweepPoint = ({ value: unknown; ok: true } & KeyFigures) | { value: unknown; ok: false; issues: InputIssue[] };

/**
 * One point of a sweep: the base design with one input changed, evaluated. The Design desk's worker calls this
 * point by point (so it can report progress and stop); `sweep` calls it for a whole list.
 * @param base - the base design, already validated (parseDesign)
 * @param path - dotted path of the field to vary, e.g. "pulley.driveTeeth"
 * @param value - the value to try
 * @returns the key figures at this value (docs/models/what-if.md), or the issues that make it invalid
 */
export function sweepPoint(base: DesignInput, path: string, value: unknown): SweepPoint {
  const doc = JSON.parse(JSON.stringify(base)) as Record<string, unknown>;
  const notGroup = nonGroupStep(doc, path);
  if (notGroup) return { value, ok: false as const, issues: [{ path, message: `"${notGroup}" is not a group of fields` }] };
  setAt(doc, path, value);
  const parsed = safeParseDesign(doc);
  if (!parsed.ok) return { value, ok: false as const, issues: parsed.issues };
  return { value, ok: true as const, ...keyFigures(evaluateValidDesign(parsed.value)) };
}

/**
 * Varies one input of a design over a list of values and returns the key outputs per value (Design desk "what if").
 * An invalid value gives an entry with its issues instead of stopping the sweep.
 * @param input - the base design (validated first)
 * @param path - dotted path of the field to vary, e.g. "pulley.driveTeeth"
 * @param values - values to try, in order
 * @returns one point per value: the key figures (steps/mm, microstep lengths [mm], speed max [m/s], accel max [m/s²], lowest resonance [Hz], …)
 * @throws EngineInputError when the base design or the path itself is invalid
 */
export function sweep(input: unknown, path: string, values: readonly unknown[]): { path: string; points: SweepPoint[] } {
  const base = parseDesign(input);
  if (typeof path !== 'string' || !/^[A-Za-z][A-Za-z0-9]*(\.[A-Za-z0-9]+)*$/.test(path)) {
    throw new EngineInputError('sweep', `path must be a dotted field path such as "pulley.driveTeeth", got ${String(path)}`, [
      { path: 'path', message: 'must be a dotted field path' },
    ]);
  }
  if (!Array.isArray(values)) {
    throw new EngineInputError('sweep', 'values must be a list', [{ path: 'values', message: 'must be a list' }]);
  }
  return { path, points: values.map((value) => sweepPoint(base, path, value)) };
}
