/**
 * Reads the published reference tables in `reference/<source>/<table>.json` for the reference tests.
 * The files are read-only data; every one is indexed with its provenance in `reference/README.md`.
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';

/** Root folder of the reference tables. */
export const REFERENCE_DIR: string = fileURLToPath(new URL('../../reference/', import.meta.url));

/**
 * What a row's expected number is (reference/README.md): printed in the source (`published`), computed by the team
 * from a formula the source gives (`derived`, with its `equation`), a second, differently built computation
 * (`independent`), or a cross-check through a general-purpose library (`library`).
 */
export const REFERENCE_LABELS = ['published', 'derived', 'independent', 'library'] as const;
export type ReferenceLabel = (typeof REFERENCE_LABELS)[number];

/** Citation of one published source. */
export interface ReferenceSource {
  /** Short name printed in every test title, e.g. "ISO 5296". */
  shortName: string;
  title: string;
  /** Edition and/or year. */
  edition: string;
  /** Section, table or equation the values come from. */
  section: string;
  /** How much of the source was seen: "seen …", "from memory", "common practice …" or "written for this project". */
  provenance: string;
  /** What was actually seen, and where (secondary reproductions are named). */
  seenVia: string;
  /** How the numbers got into this file. */
  howTranscribed: string;
  url?: string;
}

/** Allowed deviation: |actual − expected| ≤ max(abs, rel·|expected|). */
export interface Tolerance {
  rel?: number;
  abs?: number;
}

export interface ReferenceRow<I, E> {
  id: string;
  inputs: I;
  expected: E;
  tolerance?: Tolerance;
  note?: string;
  /** What the expected number is. */
  label: ReferenceLabel;
  /** The equation a derived (or independent) row was computed with. */
  equation?: string;
  /** Belt profile the row belongs to (pitch tables). */
  profile?: string;
  /** Mechanism a row applies to when it is not an engine input of the function under test. */
  mechanism?: 'corexy' | 'hbot' | 'cartesian';
}

export interface ReferenceTable<I, E> {
  source: ReferenceSource;
  units: Record<string, string>;
  rows: ReferenceRow<I, E>[];
}

/** Tolerance used when a row states none: exact quantities. */
export const DEFAULT_TOLERANCE: Tolerance = { rel: 1e-9 };

function fail(file: string, what: string): never {
  throw new Error(`[loadReference] ${file}: ${what}`);
}

function assertFiniteNumbers(value: unknown, file: string, where: string): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) fail(file, `${where} is not a finite number`);
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => assertFiniteNumbers(v, file, `${where}[${i}]`));
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) assertFiniteNumbers(v, file, `${where}.${k}`);
  }
}

function assertTableIsValid(raw: unknown, file: string): asserts raw is ReferenceTable<unknown, unknown> {
  if (raw === null || typeof raw !== 'object') fail(file, 'not a JSON object');
  const table = raw as Partial<ReferenceTable<unknown, unknown>>;
  const source = table.source as Partial<ReferenceSource> | undefined;
  if (!source) fail(file, 'missing "source"');
  for (const key of ['shortName', 'title', 'edition', 'section', 'provenance', 'seenVia', 'howTranscribed'] as const) {
    if (typeof source[key] !== 'string' || source[key].trim() === '') fail(file, `source.${key} is missing`);
  }
  if (!table.units || typeof table.units !== 'object') fail(file, 'missing "units"');
  if (!Array.isArray(table.rows) || table.rows.length === 0) fail(file, '"rows" must be a non-empty array');
  const ids = new Set<string>();
  table.rows.forEach((row, i) => {
    if (typeof row.id !== 'string' || row.id === '') fail(file, `rows[${i}].id is missing`);
    if (ids.has(row.id)) fail(file, `duplicate row id ${row.id}`);
    ids.add(row.id);
    if (row.inputs === null || typeof row.inputs !== 'object') fail(file, `${row.id}: "inputs" must be an object`);
    if (row.expected === null || typeof row.expected !== 'object' || Object.keys(row.expected).length === 0)
      fail(file, `${row.id}: "expected" must be a non-empty object`);
    if (!REFERENCE_LABELS.includes(row.label))
      fail(file, `${row.id}: label "${String(row.label)}" is not one of ${REFERENCE_LABELS.join(', ')}`);
    if (row.label === 'derived' && !(typeof row.equation === 'string' && row.equation.trim() !== ''))
      fail(file, `${row.id}: a derived row must say which equation it comes from`);
    if (row.tolerance !== undefined) {
      const { rel, abs } = row.tolerance;
      if (rel === undefined && abs === undefined) fail(file, `${row.id}: tolerance needs rel or abs`);
      if ((rel !== undefined && !(rel >= 0)) || (abs !== undefined && !(abs >= 0))) fail(file, `${row.id}: tolerance must be ≥ 0`);
    }
    assertFiniteNumbers(row.inputs, file, `${row.id}.inputs`);
    assertFiniteNumbers(row.expected, file, `${row.id}.expected`);
  });
}

/**
 * Reads and checks the shape of one reference table.
 * @param sourceSlug - folder under `reference/`, e.g. `iso-5296`
 * @param table - file name without `.json`, e.g. `pitches`
 * @returns the parsed table, typed with the caller's input and expected shapes
 */
export function loadReference<I = Record<string, number>, E = Record<string, number>>(
  sourceSlug: string,
  table: string,
): ReferenceTable<I, E> {
  const file = join(REFERENCE_DIR, sourceSlug, `${table}.json`);
  const raw: unknown = JSON.parse(readFileSync(file, 'utf8'));
  assertTableIsValid(raw, `${sourceSlug}/${table}.json`);
  return raw as ReferenceTable<I, E>;
}

/**
 * Lists every reference table as `<source>/<table>` (paths relative to `reference/`).
 * @param exclude - top-level folders to skip (e.g. `examples`, which holds demo designs, not published data)
 */
export function listReferenceTables(exclude: readonly string[] = []): string[] {
  const tables: string[] = [];
  for (const dir of readdirSync(REFERENCE_DIR).sort()) {
    if (exclude.includes(dir) || !statSync(join(REFERENCE_DIR, dir)).isDirectory()) continue;
    for (const name of readdirSync(join(REFERENCE_DIR, dir)).sort()) {
      if (name.endsWith('.json')) tables.push(`${dir}/${name.slice(0, -'.json'.length)}`);
    }
  }
  return tables;
}

/** Largest allowed |actual − expected| for a row's tolerance. */
export function toleranceBound(expected: number, tolerance: Tolerance = DEFAULT_TOLERANCE): number {
  return Math.max(tolerance.abs ?? 0, (tolerance.rel ?? 0) * Math.abs(expected));
}

/**
 * Asserts a computed value matches a published one within the row's tolerance, with a message that names the row.
 * @param actual - value from the engine (or from the library under test)
 * @param expected - published value
 * @param tolerance - the row's tolerance (default: exact, rel 1e-9)
 * @param label - row id and quantity, printed on failure
 */
export function expectWithinTolerance(actual: number, expected: number, tolerance: Tolerance | undefined, label: string): void {
  expect(typeof actual === 'number' && Number.isFinite(actual), `${label}: got ${String(actual)}, not a finite number`).toBe(true);
  const bound = toleranceBound(expected, tolerance ?? DEFAULT_TOLERANCE);
  expect(Math.abs(actual - expected), `${label}: got ${actual}, published ${expected} (allowed ±${bound})`).toBeLessThanOrEqual(bound);
}

/** Title fragment naming the source, the row's label and, for a remembered source, "from memory". */
export function sourceLabel(table: ReferenceTable<unknown, unknown>, row?: ReferenceRow<unknown, unknown>): string {
  const memory = table.source.provenance === 'from memory' ? ', from memory' : '';
  const labels = row ? row.label : [...new Set(table.rows.map((r) => r.label))].join('/');
  return `${table.source.shortName}, ${labels}${memory}`;
}

/** One table-driven case: the test title fragment "<row id> (<source short name>, <label>[, from memory])" and the row. */
export type ReferenceCase<I, E> = [title: string, row: ReferenceRow<I, E>];

/**
 * Rows as `it.each` cases whose title names the row id and its source; use with a `%s` title so that nothing is
 * truncated, e.g. `it.each(referenceCases(table))('when %s, then …', (_title, row) => …)`.
 * @param table - a loaded reference table
 * @param rows - a subset of its rows (default: all)
 */
export function referenceCases<I, E>(table: ReferenceTable<I, E>, rows: ReferenceRow<I, E>[] = table.rows): ReferenceCase<I, E>[] {
  return rows.map((row) => [
    `${row.id} (${sourceLabel(table as ReferenceTable<unknown, unknown>, row as ReferenceRow<unknown, unknown>)})`,
    row,
  ]);
}
