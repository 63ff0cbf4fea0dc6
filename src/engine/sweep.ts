import { EngineInputError } from './errors';
import type { InputIssue } from './errors';
import { keyFigures, type KeyFigures } from './compareMechanisms';
import { evaluateValidDesign } from './evaluateDesign';
import { parseDesign, safeParseDesign } from './schema';

/** One value of a sweep. */
export type SweepPoint = ({ value: unknown; ok: true } & KeyFigures) | { value: unknown; ok: false; issues: InputIssue[] };

function setPath(doc: Record<string, unknown>, parts: string[], value: unknown): string | null {
  let node: Record<string, unknown> = doc;
  for (let i = 0; i < parts.length - 1; i++) {
    const next = node[parts[i]];
    if (next === null || typeof next !== 'object' || Array.isArray(next)) {
      return `"${parts.slice(0, i + 1).join('.')}" is not a group of fields`;
    }
    node = next as Record<string, unknown>;
  }
  node[parts[parts.length - 1]] = value;
  return null;
}

/**
 * Varies one input of a design over a list of values and returns the key outputs per value (Design desk "what if").
 * An invalid value gives an entry with its issues instead of stopping the sweep.
 * @param input - the base design (validated first)
 * @param path - dotted path of the field to vary, e.g. "pulley.driveTeeth"
 * @param values - values to try, in order
 * @returns one point per value: steps/mm, microstep lengths [mm], speed max [m/s], accel max X/Y/worst [m/s²], lowest resonance [Hz]
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
  const parts = path.split('.');
  const points: SweepPoint[] = values.map((value) => {
    const doc = JSON.parse(JSON.stringify(base)) as Record<string, unknown>;
    const bad = setPath(doc, parts, value);
    if (bad) return { value, ok: false as const, issues: [{ path, message: bad }] };
    const parsed = safeParseDesign(doc);
    if (!parsed.ok) return { value, ok: false as const, issues: parsed.issues };
    return { value, ok: true as const, ...keyFigures(evaluateValidDesign(parsed.value)) };
  });
  return { path, points };
}
