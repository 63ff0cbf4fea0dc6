import type { DesignResult, ModeId } from '@/engine';

/**
 * The large numeric parts of an engine result, which the engine worker sends as one transferable Float64Array
 * (moved, not copied) and only when the visible result tab needs them:
 * - `map`: the stiffness map (grid coordinates and the lowest natural frequency at every grid point);
 * - `directions`: everything sampled per travel direction (envelope, effective mass, coupling shares);
 * - `modeMap`: the lowest structural mode over the travel (frequency and which mode, on the map's grid);
 * - `errorMap`: the worst positioning error over the travel (on the map's grid).
 * Everything else of the result is small and always sent as it is.
 */
export type ResultPart = 'map' | 'directions' | 'modeMap' | 'errorMap';

/** Every part, in packing order. */
export const RESULT_PARTS: readonly ResultPart[] = ['map', 'directions', 'modeMap', 'errorMap'];

/** Mode ids packed as their index here (a grid of names would not fit a Float64Array). */
export const PACKED_MODE_IDS: readonly ModeId[] = ['belt', 'gantry-bending', 'gantry-yaw', 'cross-shaft'];

type Field = { path: string[]; kind: 'numbers' | 'grid' | 'motors' | 'modeGrid' };

/** Where each part lives in the result. A tab that reads one of these fields must ask for its part. */
const PART_FIELDS: Record<ResultPart, Field[]> = {
  map: [
    { path: ['stiffness', 'xMm'], kind: 'numbers' },
    { path: ['stiffness', 'yMm'], kind: 'numbers' },
    { path: ['stiffness', 'lowestFrequencyHz'], kind: 'grid' },
  ],
  directions: [
    { path: ['envelope', 'directionsDeg'], kind: 'numbers' },
    { path: ['envelope', 'accelMaxMPerS2'], kind: 'numbers' },
    { path: ['envelope', 'accelAtCruiseMPerS2'], kind: 'numbers' },
    { path: ['envelope', 'speedMaxMPerS'], kind: 'numbers' },
    { path: ['envelope', 'limitingMotor'], kind: 'motors' },
    { path: ['mass', 'effectiveKg'], kind: 'numbers' },
    { path: ['coupling', 'speedShare', 'a'], kind: 'numbers' },
    { path: ['coupling', 'speedShare', 'b'], kind: 'numbers' },
    { path: ['coupling', 'forceShare', 'a'], kind: 'numbers' },
    { path: ['coupling', 'forceShare', 'b'], kind: 'numbers' },
  ],
  modeMap: [
    { path: ['stiffness', 'lowestMap', 'frequencyHz'], kind: 'grid' },
    { path: ['stiffness', 'lowestMap', 'modeId'], kind: 'modeGrid' },
  ],
  errorMap: [{ path: ['errorBudget', 'totalMm'], kind: 'grid' }],
};

/** Packed parts: one Float64Array and, per field, where its values start and how they are shaped. */
export interface PackedParts {
  parts: ResultPart[];
  values: Float64Array;
  /** Per packed field in order: its length, and for a grid the length of each row. */
  shapes: { length: number; rows?: number[] }[];
}

function read(node: unknown, path: string[]): unknown {
  let at = node;
  for (const key of path) at = (at as Record<string, unknown>)[key];
  return at;
}

/** Copies the objects along `path` (so the original result is never changed) and sets the field. */
function write(root: Record<string, unknown>, path: string[], value: unknown): void {
  let at = root;
  for (const key of path.slice(0, -1)) {
    at[key] = { ...(at[key] as Record<string, unknown>) };
    at = at[key] as Record<string, unknown>;
  }
  at[path[path.length - 1]] = value;
}

/**
 * Splits a result for the trip from the worker: the result without its large parts (their arrays emptied), and
 * the wanted parts packed into one Float64Array whose buffer can be transferred.
 * @param result - a full engine result
 * @param wanted - parts to pack; the others are left out
 */
export function packResult(result: DesignResult, wanted: readonly ResultPart[]): { light: DesignResult; packed: PackedParts } {
  const light = { ...result } as unknown as Record<string, unknown>;
  const parts = RESULT_PARTS.filter((p) => wanted.includes(p));
  const shapes: PackedParts['shapes'] = [];
  let total = 0;
  for (const part of parts)
    for (const field of PART_FIELDS[part]) {
      const value = read(result, field.path) as unknown[];
      if (field.kind === 'grid' || field.kind === 'modeGrid') {
        const rows = (value as unknown[][]).map((r) => r.length);
        const length = rows.reduce((a, b) => a + b, 0);
        shapes.push({ length, rows });
        total += length;
      } else {
        shapes.push({ length: value.length });
        total += value.length;
      }
    }
  const values = new Float64Array(total);
  let at = 0;
  for (const part of parts)
    for (const field of PART_FIELDS[part]) {
      const value = read(result, field.path);
      if (field.kind === 'grid') for (const row of value as number[][]) for (const v of row) values[at++] = v;
      else if (field.kind === 'modeGrid')
        for (const row of value as ModeId[][]) for (const m of row) values[at++] = PACKED_MODE_IDS.indexOf(m);
      else if (field.kind === 'motors') for (const m of value as string[]) values[at++] = m === 'B' ? 1 : 0;
      else for (const v of value as number[]) values[at++] = v;
    }
  for (const part of RESULT_PARTS) for (const field of PART_FIELDS[part]) write(light, field.path, []);
  return { light: light as unknown as DesignResult, packed: { parts, values, shapes } };
}

/**
 * Puts packed parts back into a result (a new object; the given one is not changed).
 * @param light - a result from {@link packResult} (or one merged before)
 * @param packed - parts to put back
 */
export function unpackResult(light: DesignResult, packed: PackedParts): DesignResult {
  const out = { ...light } as unknown as Record<string, unknown>;
  const { values, shapes } = packed;
  let at = 0;
  let i = 0;
  for (const part of packed.parts)
    for (const field of PART_FIELDS[part]) {
      const shape = shapes[i++];
      let value: unknown;
      if (field.kind === 'grid' || field.kind === 'modeGrid') {
        const rows: unknown[][] = [];
        let start = at;
        for (const n of shape.rows ?? []) {
          const row = values.subarray(start, start + n);
          rows.push(field.kind === 'grid' ? Array.from(row) : Array.from(row, (v) => PACKED_MODE_IDS[v]));
          start += n;
        }
        value = rows;
      } else if (field.kind === 'motors') {
        value = Array.from(values.subarray(at, at + shape.length), (v) => (v === 1 ? 'B' : 'A'));
      } else value = Array.from(values.subarray(at, at + shape.length));
      at += shape.length;
      write(out, field.path, value);
    }
  return out as unknown as DesignResult;
}
