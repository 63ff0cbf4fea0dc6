import { parse } from 'csv-parse/sync';
import { UNIT_TABLE } from '@/format/unitTable';

/** Speed units a torque table may use. */
export type TorqueCsvSpeedUnit = 'rev/s' | 'rpm';
/** Torque units a torque table may use. */
export type TorqueCsvTorqueUnit = 'N·m' | 'N·cm' | 'oz·in';

/** One point of a motor's torque–speed curve, in SI-based units. */
export interface TorquePoint {
  /** Shaft speed [rev/s]. */
  speedRevPerS: number;
  /** Available torque [N·m]. */
  torqueNm: number;
}

/** A parsed torque–speed table. */
export interface TorqueTable {
  /** Points in file order (speed strictly increasing). */
  points: TorquePoint[];
  /** Units the file's header named. */
  sourceUnits: { speed: TorqueCsvSpeedUnit; torque: TorqueCsvTorqueUnit };
}

/** Where and what: one problem in a torque table. */
export interface CsvErrorDetail {
  /** 1-based line in the file (the header is line 1 unless blank or comment lines precede it); null for the file as a whole. */
  line: number | null;
  /** Column name as written in the header; null when the problem is the whole row or file. */
  column: string | null;
  message: string;
}

/** A CSV upload (torque table, job points) that cannot be used; `details` names every problem found (up to 20). Answered with 400. */
export class CsvError extends Error {
  readonly code = 'invalid_csv';
  /** HTTP status a route should answer with. */
  readonly httpStatus = 400;
  readonly details: CsvErrorDetail[];

  /**
   * @param details - every problem with its line and column
   * @param what - the file in words for the message ("torque table", "job file")
   */
  constructor(details: CsvErrorDetail[], what = 'torque table') {
    const first = details[0];
    const where = first ? [first.line !== null ? `line ${first.line}` : '', first.column ?? ''].filter(Boolean).join(', ') : '';
    const more = details.length > 1 ? ` (and ${details.length - 1} more problem${details.length > 2 ? 's' : ''})` : '';
    super(`The ${what} cannot be used: ${where ? `${where}: ` : ''}${first?.message ?? 'unknown problem'}${more}`);
    this.name = 'CsvError';
    this.details = details;
  }
}

/** Size limits of a torque table. */
export const TORQUE_CSV_LIMITS = Object.freeze({ minPoints: 3, maxPoints: 500 });

const MAX_DETAILS = 20;

// Header spellings, compared after lower-casing and removing spaces and the separators · ⋅ • ∙ * . -
const SPEED_UNITS: Record<string, TorqueCsvSpeedUnit> = {
  'rev/s': 'rev/s',
  'revs/s': 'rev/s',
  'rev/sec': 'rev/s',
  'revs/sec': 'rev/s',
  'r/s': 'rev/s',
  rps: 'rev/s',
  revpers: 'rev/s',
  revpersec: 'rev/s',
  revolutionspersecond: 'rev/s',
  'revolutions/s': 'rev/s',
  '1/s': 'rev/s',
  rpm: 'rpm',
  'rev/min': 'rpm',
  'revs/min': 'rpm',
  'r/min': 'rpm',
  revpermin: 'rpm',
  revolutionsperminute: 'rpm',
  'revolutions/min': 'rpm',
  '1/min': 'rpm',
  'min^1': 'rpm',
  'u/min': 'rpm',
};
const TORQUE_UNITS: Record<string, TorqueCsvTorqueUnit> = {
  nm: 'N·m',
  newtonmetre: 'N·m',
  newtonmeter: 'N·m',
  newtonmetres: 'N·m',
  newtonmeters: 'N·m',
  ncm: 'N·cm',
  newtoncentimetre: 'N·cm',
  newtoncentimeter: 'N·cm',
  newtoncentimetres: 'N·cm',
  newtoncentimeters: 'N·cm',
  ozin: 'oz·in',
  ozfin: 'oz·in',
  inoz: 'oz·in',
  inozf: 'oz·in',
  ounceinch: 'oz·in',
  ounceinches: 'oz·in',
  ounceforceinch: 'oz·in',
  ounceforceinches: 'oz·in',
};
/** Step rates need the motor's step angle to become a shaft speed, so they get their own message. */
const STEP_RATE_UNITS = new Set(['hz', 'pps', 'sps', 'steps/s', 'pulses/s', 'step/s', 'pulse/s']);
const QUANTITY_WORDS = new Set([
  'speed',
  'velocity',
  'rotational',
  'rotation',
  'shaft',
  'motor',
  'angular',
  'torque',
  'pull-out',
  'pullout',
  'pull',
  'out',
  'available',
  'max',
  'maximum',
  'dynamic',
  'in',
  'of',
]);

const SPEED_HINT = 'rev/s, rps or rpm';
const TORQUE_HINT = 'N·m, N·cm or oz·in';

// The conversion factors without mathjs at run time (its ~30 MB of library code would sit on the API server's
// event-loop heap and slow every major garbage collection there: DEVELOPERS.md "Performance"). rpm and N·cm are exact
// by definition; ozf·in comes from the unit table the client converts with, generated from mathjs with ozf defined as
// 1 oz (avoirdupois, 0.028 349 523 125 kg exactly) × standard gravity (9.806 65 m/s² exactly), which gives
// 1 ozf·in = 7.061 552e-3 N·m as in NIST SP 811 (Guide for the Use of the SI, 2008, Appendix B.8).
// tests/unit/server/uploads/torqueCsv.test.ts checks every factor against mathjs, bit for bit.
const UNIT_FACTORS: { speed: Record<TorqueCsvSpeedUnit, number>; torque: Record<TorqueCsvTorqueUnit, number> } = {
  speed: { 'rev/s': 1, rpm: 1 / 60 },
  torque: { 'N·m': 1, 'N·cm': 0.01, 'oz·in': UNIT_TABLE['ozf in'].si },
};

/**
 * Factor from a torque table's units to rev/s and N·m (rpm → 1/60; N·cm → 0.01; ozf·in → 7.061 552e-3 per NIST SP 811).
 * @param unit - a unit as reported in {@link TorqueTable.sourceUnits}
 * @returns the multiplication factor to rev/s (speed units) or N·m (torque units)
 */
export function torqueCsvUnitFactor(unit: TorqueCsvSpeedUnit | TorqueCsvTorqueUnit): number {
  return unit === 'rev/s' || unit === 'rpm' ? UNIT_FACTORS.speed[unit] : UNIT_FACTORS.torque[unit];
}

type HeaderColumn = { kind: 'speed'; unit: TorqueCsvSpeedUnit; name: string } | { kind: 'torque'; unit: TorqueCsvTorqueUnit; name: string };

/**
 * Parses a motor's torque–speed table. The header names the units, e.g. `speed_rpm,torque_Ncm` or
 * `speed (rev/s), torque (oz·in)`; columns may come in either order. Separators: comma, semicolon or tab (taken
 * from the header line); with semicolon or tab a decimal comma (`0,45`) is accepted. A byte-order mark, blank lines,
 * lines starting with `#`, and surrounding spaces are ignored.
 *
 * Validation: two columns, finite numbers, speed ≥ 0 and strictly increasing, torque ≥ 0, 3–500 points.
 *
 * @param text - the file's text (UTF-8 decoded)
 * @returns the points in rev/s and N·m plus the units the file used
 * @throws CsvError whose `details` name line (header = line 1) and column of every problem (up to 20)
 */
export function parseTorqueCsv(text: string): TorqueTable {
  // One line ending, so csv-parse's line count is the line number a text editor shows.
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
      // Header plus one record over the limit is enough to report "too many".
      to: TORQUE_CSV_LIMITS.maxPoints + 2,
    }) as unknown as Array<{ record: string[]; info: { lines: number } }>;
  } catch (err) {
    throw new CsvError([csvParseDetail(err)]);
  }

  if (records.length === 0) {
    throw new CsvError([{ line: null, column: null, message: `the file is empty; expected a header such as "speed_rpm,torque_Ncm"` }]);
  }

  const [headerRecord, ...rows] = records;
  const headerLine = headerRecord.info.lines;
  const columns = parseHeader(withoutTrailingEmpty(headerRecord.record), headerLine);
  const speedIndex = columns.findIndex((c) => c.kind === 'speed');
  const torqueIndex = 1 - speedIndex;
  const speedColumn = columns[speedIndex] as Extract<HeaderColumn, { kind: 'speed' }>;
  const torqueColumn = columns[torqueIndex] as Extract<HeaderColumn, { kind: 'torque' }>;

  const details: CsvErrorDetail[] = [];
  const points: TorquePoint[] = [];
  let previous: { speed: number; line: number } | undefined;
  const speedFactor = torqueCsvUnitFactor(speedColumn.unit);
  const torqueFactor = torqueCsvUnitFactor(torqueColumn.unit);

  for (const [index, { record, info }] of rows.entries()) {
    if (details.length >= MAX_DETAILS) break;
    const line = info.lines;
    if (index >= TORQUE_CSV_LIMITS.maxPoints) {
      details.push({ line, column: null, message: `too many rows; at most ${TORQUE_CSV_LIMITS.maxPoints} points are accepted` });
      break;
    }
    const cells = withoutTrailingEmpty(record);
    if (cells.length !== 2) {
      details.push({
        line,
        column: null,
        message: `expected 2 values (${columns.map((c) => c.name).join(', ')}), found ${cells.length}`,
      });
      continue;
    }
    const speed = readNumber(cells[speedIndex], line, speedColumn.name, isDecimalCommaAllowed, details);
    const torque = readNumber(cells[torqueIndex], line, torqueColumn.name, isDecimalCommaAllowed, details);
    if (speed === undefined || torque === undefined) continue;

    let isRowValid = true;
    if (speed < 0) {
      details.push({ line, column: speedColumn.name, message: `speed must not be negative (found ${cells[speedIndex]})` });
      isRowValid = false;
    } else if (previous && speed <= previous.speed) {
      details.push({
        line,
        column: speedColumn.name,
        message: `speed must increase from row to row: ${cells[speedIndex]} ${speedColumn.unit} follows ${previous.speed} ${speedColumn.unit} on line ${previous.line}`,
      });
      isRowValid = false;
    }
    if (torque < 0) {
      details.push({ line, column: torqueColumn.name, message: `torque must not be negative (found ${cells[torqueIndex]})` });
      isRowValid = false;
    }
    if (!isRowValid) continue;
    previous = { speed, line };
    points.push({ speedRevPerS: speed * speedFactor, torqueNm: torque * torqueFactor });
  }

  if (details.length === 0 && points.length < TORQUE_CSV_LIMITS.minPoints) {
    details.push({
      line: null,
      column: null,
      message: `at least ${TORQUE_CSV_LIMITS.minPoints} points are needed to draw a curve, found ${points.length}`,
    });
  }
  if (details.length > 0) throw new CsvError(details);

  return { points, sourceUnits: { speed: speedColumn.unit, torque: torqueColumn.unit } };
}

/** The separator used most in the first line that holds data (comma on a tie or when there is none). */
export function detectDelimiter(text: string): ',' | ';' | '\t' {
  const firstLine = text.split('\n').find((l) => l.trim() !== '' && !l.trimStart().startsWith('#')) ?? '';
  const count = (ch: string): number => firstLine.split(ch).length - 1;
  const counts: Array<[',' | ';' | '\t', number]> = [
    [',', count(',')],
    [';', count(';')],
    ['\t', count('\t')],
  ];
  return counts.reduce((best, c) => (c[1] > best[1] ? c : best))[0];
}

/** Drops empty cells past the second (a trailing separator), keeping an empty second cell to report it. */
function withoutTrailingEmpty(cells: string[]): string[] {
  let end = cells.length;
  while (end > 2 && cells[end - 1] === '') end--;
  return cells.slice(0, end);
}

function parseHeader(cells: string[], line: number): [HeaderColumn, HeaderColumn] {
  const example = 'e.g. "speed_rpm,torque_Ncm" or "speed (rev/s), torque (oz·in)"';
  if (cells.length !== 2) {
    throw new CsvError([
      {
        line,
        column: null,
        message: `the header must name 2 columns, speed and torque with their units (${example}); found ${cells.length}`,
      },
    ]);
  }
  const details: CsvErrorDetail[] = [];
  const columns = cells.map((cell, i) => {
    const name = cell === '' ? `column ${i + 1}` : cell;
    const { unitKey, words } = splitHeaderCell(cell);
    const speedUnit = SPEED_UNITS[unitKey];
    const torqueUnit = TORQUE_UNITS[unitKey];
    let message: string | undefined;
    if (STEP_RATE_UNITS.has(unitKey)) {
      message = `step or pulse rates depend on the step angle; convert the speed to ${SPEED_HINT}`;
    } else if (!speedUnit && !torqueUnit) {
      message = unitKey
        ? `unknown unit "${unitKey}"; use ${SPEED_HINT} for speed and ${TORQUE_HINT} for torque (${example})`
        : `no unit given; name it in the header (${example})`;
    } else if (speedUnit && words.has('torque')) {
      message = `the column says torque but its unit ${speedUnit} is a speed`;
    } else if (torqueUnit && (words.has('speed') || words.has('velocity'))) {
      message = `the column says speed but its unit ${torqueUnit} is a torque`;
    }
    if (message) {
      details.push({ line, column: name, message });
      return undefined;
    }
    return speedUnit ? ({ kind: 'speed', unit: speedUnit, name } as const) : ({ kind: 'torque', unit: torqueUnit!, name } as const);
  });
  if (details.length > 0) throw new CsvError(details);
  const [a, b] = columns as [HeaderColumn, HeaderColumn];
  if (a.kind === b.kind) {
    throw new CsvError([
      {
        line,
        column: b.name,
        message: `both columns are ${a.kind}s; one must be the speed (${SPEED_HINT}) and one the torque (${TORQUE_HINT})`,
      },
    ]);
  }
  return [a, b];
}

/** Splits a header cell into its quantity words and a squashed unit key (`Torque [N.m]` → `nm`). */
function splitHeaderCell(cell: string): { unitKey: string; words: Set<string> } {
  const tokens = cell
    .toLowerCase()
    .replace(/[()[\]{}_,;:"']/g, ' ')
    .split(/\s+/)
    .filter(Boolean);
  const words = new Set(tokens.filter((t) => QUANTITY_WORDS.has(t)));
  // "in" is both a word and the inch: keep it when it is the last token after an ounce ("oz in").
  const unitTokens = tokens.filter((t, i) => !QUANTITY_WORDS.has(t) || (t === 'in' && i > 0 && /^oz/.test(tokens[i - 1])));
  const unitKey = unitTokens.join('').replace(/[·⋅•∙*.\-\s]/g, '');
  return { unitKey, words };
}

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Reads one numeric cell (a decimal comma where the separator allows it); records a problem and returns undefined otherwise. */
export function readNumber(
  cell: string,
  line: number,
  column: string,
  isDecimalCommaAllowed: boolean,
  details: CsvErrorDetail[],
): number | undefined {
  if (cell === '') {
    details.push({ line, column, message: 'empty cell; a number is needed' });
    return undefined;
  }
  const text = isDecimalCommaAllowed && /^[+-]?\d+,\d+$/.test(cell) ? cell.replace(',', '.') : cell;
  const value = NUMBER.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(value)) {
    details.push({ line, column, message: `"${cell}" is not a number` });
    return undefined;
  }
  return value;
}

/** A csv-parse failure as one problem with its line. */
export function csvParseDetail(err: unknown): CsvErrorDetail {
  const e = err as { code?: string; lines?: number; message?: string };
  const line = typeof e.lines === 'number' ? e.lines : null;
  switch (e.code) {
    case 'CSV_QUOTE_NOT_CLOSED':
      return { line, column: null, message: 'a quote (") is opened but never closed' };
    case 'CSV_INVALID_CLOSING_QUOTE':
      return { line, column: null, message: 'unexpected text after a closing quote (")' };
    default:
      return { line, column: null, message: `the file is not valid CSV (${e.message ?? 'unknown error'})` };
  }
}
