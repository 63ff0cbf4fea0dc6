import { parse } from 'csv-parse/sync';
import { JOB_MAX_POINTS } from '@/engine';
import { CsvError, csvParseDetail, detectDelimiter, readNumber, type CsvErrorDetail } from './torqueCsv';

/** Length units a job file may use for x and y. */
export type JobCsvLengthUnit = 'mm' | 'in';
/** Time units a job file may use for the dwell. */
export type JobCsvTimeUnit = 's' | 'ms';

/** One job point in the design's units. */
export interface JobCsvPoint {
  xMm: number;
  yMm: number;
  dwellS: number;
}

/** A parsed job file. */
export interface JobTable {
  points: JobCsvPoint[];
  /** Units the header named (or the defaults it fell back to), and whether the file had a dwell column. */
  sourceUnits: { x: JobCsvLengthUnit; y: JobCsvLengthUnit; dwell: JobCsvTimeUnit | null };
}

/** Size limits of a job file: as many points as a design's job may hold. */
export const JOB_CSV_LIMITS = Object.freeze({ minPoints: 1, maxPoints: JOB_MAX_POINTS, maxBytes: 64 * 1024 });

const MAX_DETAILS = 20;
/** Largest coordinate the design schema accepts [mm]. */
const MAX_COORDINATE_MM = 10000;
/** Longest dwell the design schema accepts [s]. */
const MAX_DWELL_S = 3600;

// 1 in = 25.4 mm exactly (NIST SP 811, Appendix B.8); 1 ms = 1e-3 s.
const LENGTH_FACTOR: Record<JobCsvLengthUnit, number> = { mm: 1, in: 25.4 };
const TIME_FACTOR: Record<JobCsvTimeUnit, number> = { s: 1, ms: 1e-3 };

const LENGTH_UNITS: Record<string, JobCsvLengthUnit> = {
  mm: 'mm',
  millimetre: 'mm',
  millimetres: 'mm',
  millimeter: 'mm',
  millimeters: 'mm',
  in: 'in',
  inch: 'in',
  inches: 'in',
  '"': 'in',
};
const TIME_UNITS: Record<string, JobCsvTimeUnit> = {
  s: 's',
  sec: 's',
  secs: 's',
  second: 's',
  seconds: 's',
  ms: 'ms',
  msec: 'ms',
  millisecond: 'ms',
  milliseconds: 'ms',
};
const NAMES: Record<string, 'x' | 'y' | 'dwell'> = { x: 'x', y: 'y', dwell: 'dwell', pause: 'dwell', wait: 'dwell' };
const EXAMPLE = 'e.g. "x_mm,y_mm,dwell_s" or "x (in), y (in)"';
/** Words a header may add after the column name ("x position (mm)", "dwell time (s)"). */
const QUANTITY_WORDS = new Set(['position', 'pos', 'coordinate', 'time']);

type Column = { name: string; kind: 'x' | 'y' | 'dwell'; unit: JobCsvLengthUnit | JobCsvTimeUnit };

/** Splits a header cell into its name and unit (`X [mm]` → x, mm; `dwell_ms` → dwell, ms). */
function splitCell(cell: string): { word: string; unit: string } {
  const tokens = cell
    .toLowerCase()
    .replace(/[()[\]{}_,;:']/g, ' ')
    .split(/\s+/)
    .filter(Boolean);
  const unit = tokens.slice(1).filter((t) => !QUANTITY_WORDS.has(t));
  return { word: tokens[0] ?? '', unit: unit.join('') };
}

function parseHeader(cells: string[], line: number): Column[] {
  const details: CsvErrorDetail[] = [];
  const columns: Column[] = [];
  cells.forEach((cell, i) => {
    const name = cell === '' ? `column ${i + 1}` : cell;
    const { word, unit } = splitCell(cell);
    const kind = NAMES[word];
    if (!kind) {
      const numeric = /^[+-]?[\d.,]+$/.test(cell.trim());
      details.push({
        line,
        column: name,
        message: numeric
          ? `the first line must be a header naming the columns (${EXAMPLE})`
          : `unknown column "${cell}"; expected x, y and optionally dwell (${EXAMPLE})`,
      });
      return;
    }
    if (columns.some((c) => c.kind === kind)) {
      details.push({ line, column: name, message: `the ${kind} column appears twice` });
      return;
    }
    if (kind === 'dwell') {
      const u = unit === '' ? 's' : TIME_UNITS[unit];
      if (!u) details.push({ line, column: name, message: `unknown time unit "${unit}"; use s or ms` });
      else columns.push({ name, kind, unit: u });
    } else {
      const u = unit === '' ? 'mm' : LENGTH_UNITS[unit];
      if (!u) details.push({ line, column: name, message: `unknown length unit "${unit}"; use mm or in` });
      else columns.push({ name, kind, unit: u });
    }
  });
  if (details.length === 0) {
    for (const need of ['x', 'y'] as const) {
      if (!columns.some((c) => c.kind === need)) {
        details.push({ line, column: null, message: `the header has no ${need} column (${EXAMPLE})` });
      }
    }
  }
  if (details.length > 0) throw new CsvError(details.slice(0, MAX_DETAILS), 'job file');
  return columns;
}

/** Rounds unit-converted values so no float dust (2.5400000000000005) reaches the design. */
const tidy = (v: number) => Number(v.toPrecision(12));

/**
 * Parses a job file: a header naming the columns x, y and optionally dwell (any order, each with an optional unit:
 * mm or in for x and y, s or ms for the dwell; without a unit mm and s), then one point per line. Separators
 * comma, semicolon or tab (taken from the header line); with semicolon or tab a decimal comma (`12,5`) is accepted.
 * A byte-order mark, blank lines, lines starting with `#` and surrounding spaces are ignored; an empty dwell cell
 * means no dwell.
 *
 * Validation: finite numbers, |x|, |y| ≤ 10 000 mm, 0 ≤ dwell ≤ 3600 s, 1 … 1000 points.
 *
 * @param text - the file's text (UTF-8 decoded)
 * @returns the points in mm and s plus the units the file used
 * @throws CsvError whose `details` name line (header = line 1) and column of every problem (up to 20)
 * @see docs/models/job-timing.md
 */
export function parseJobCsv(text: string): JobTable {
  const normalized = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const delimiter = detectDelimiter(normalized);
  const isDecimalCommaAllowed = delimiter !== ',';
  let records: Array<{ record: string[]; info: { lines: number } }>;
  try {
    records = parse(normalized, {
      delimiter,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      skip_records_with_empty_values: true,
      trim: true,
      comment: '#',
      comment_no_infix: true,
      to: JOB_CSV_LIMITS.maxPoints + 2,
    }) as unknown as Array<{ record: string[]; info: { lines: number } }>;
  } catch (err) {
    throw new CsvError([csvParseDetail(err)], 'job file');
  }
  if (records.length === 0) {
    throw new CsvError(
      [{ line: null, column: null, message: `the file is empty; expected a header such as "x_mm,y_mm,dwell_s"` }],
      'job file',
    );
  }
  const [headerRecord, ...rows] = records;
  const headerCells = headerRecord.record.slice();
  while (headerCells.length > 1 && headerCells[headerCells.length - 1] === '') headerCells.pop();
  const columns = parseHeader(headerCells, headerRecord.info.lines);

  const details: CsvErrorDetail[] = [];
  const points: JobCsvPoint[] = [];
  for (const [index, { record, info }] of rows.entries()) {
    if (details.length >= MAX_DETAILS) break;
    const line = info.lines;
    if (index >= JOB_CSV_LIMITS.maxPoints) {
      details.push({ line, column: null, message: `too many rows; a job holds at most ${JOB_CSV_LIMITS.maxPoints} points` });
      break;
    }
    const cells = record.slice();
    while (cells.length > columns.length && cells[cells.length - 1] === '') cells.pop();
    if (cells.length !== columns.length && !(cells.length === columns.length - 1 && columns[columns.length - 1].kind === 'dwell')) {
      details.push({
        line,
        column: null,
        message: `expected ${columns.length} values (${columns.map((c) => c.name).join(', ')}), found ${cells.length}`,
      });
      continue;
    }
    const point: Partial<JobCsvPoint> = { dwellS: 0 };
    let isRowValid = true;
    columns.forEach((col, i) => {
      const cell = cells[i] ?? '';
      if (col.kind === 'dwell' && cell === '') return;
      const value = readNumber(cell, line, col.name, isDecimalCommaAllowed, details);
      if (value === undefined) {
        isRowValid = false;
        return;
      }
      if (col.kind === 'dwell') {
        const s = tidy(value * TIME_FACTOR[col.unit as JobCsvTimeUnit]);
        if (s < 0 || s > MAX_DWELL_S) {
          details.push({ line, column: col.name, message: `dwell must be between 0 and ${MAX_DWELL_S} s (found ${cell})` });
          isRowValid = false;
        } else point.dwellS = s;
      } else {
        const mm = tidy(value * LENGTH_FACTOR[col.unit as JobCsvLengthUnit]);
        if (Math.abs(mm) > MAX_COORDINATE_MM) {
          details.push({
            line,
            column: col.name,
            message: `${col.kind} must be within ±${MAX_COORDINATE_MM} mm (found ${cell} ${col.unit})`,
          });
          isRowValid = false;
        } else if (col.kind === 'x') point.xMm = mm;
        else point.yMm = mm;
      }
    });
    if (isRowValid) points.push(point as JobCsvPoint);
  }
  if (details.length === 0 && points.length < JOB_CSV_LIMITS.minPoints) {
    details.push({ line: null, column: null, message: 'the file has a header but no points' });
  }
  if (details.length > 0) throw new CsvError(details.slice(0, MAX_DETAILS), 'job file');
  const unitOf = (kind: 'x' | 'y') => columns.find((c) => c.kind === kind)!.unit as JobCsvLengthUnit;
  const dwell = columns.find((c) => c.kind === 'dwell');
  return { points, sourceUnits: { x: unitOf('x'), y: unitOf('y'), dwell: dwell ? (dwell.unit as JobCsvTimeUnit) : null } };
}
