import fs from 'node:fs';
import path from 'node:path';

/**
 * Shared pieces of `npm run bench`: one figure per measured thing, statistics, the table, and the comparison with
 * the figures recorded in scripts/bench/results.json (a regression of more than 2× prints a warning; a benchmark
 * never fails a build).
 */

/** One measured figure. */
export interface Figure {
  /** Stable key, e.g. "editor.plots.median" (used to compare with the recorded run). */
  id: string;
  /** What it is, for people. */
  label: string;
  /** The target in words, e.g. "≤ 100 ms". */
  target: string;
  /** The measured value. */
  value: number;
  /** Unit of `value` ("ms", "kB", "×", "req/s"). */
  unit: string;
  /** Measured against the target: value ÷ limit for "≤" targets, limit ÷ value for "≥" targets (≤ 1 meets it). */
  ratio: number | null;
  /** Whether the target is met (null: no target, shown for information). */
  ok: boolean | null;
  /** Which way is better, for the regression check. */
  better: 'lower' | 'higher';
  /** Extra words shown under the table (how it was measured, spread). */
  note?: string;
}

/** A figure with a "≤ limit" target. */
export function atMost(id: string, label: string, value: number, unit: string, limit: number, note?: string): Figure {
  const ratio = limit > 0 ? value / limit : null; // a count that must be 0 has no meaningful ratio
  return { id, label, target: `≤ ${limit} ${unit}`.trim(), value, unit, ratio, ok: value <= limit, better: 'lower', note };
}

/** A figure with a "≥ limit" target. */
export function atLeast(id: string, label: string, value: number, unit: string, limit: number, note?: string): Figure {
  return { id, label, target: `≥ ${limit} ${unit}`.trim(), value, unit, ratio: limit / value, ok: value >= limit, better: 'higher', note };
}

/** A figure shown for information (no target). */
export function info(id: string, label: string, value: number, unit: string, better: 'lower' | 'higher' = 'lower', note?: string): Figure {
  return { id, label, target: '–', value, unit, ratio: null, ok: null, better, note };
}

/** Median of numbers (NaN for none). */
export function median(xs: readonly number[]): number {
  return percentile(xs, 50);
}

/** The p-th percentile (nearest rank on the sorted values). */
export function percentile(xs: readonly number[], p: number): number {
  if (!xs.length) return Number.NaN;
  const s = [...xs].sort((a, b) => a - b);
  if (p === 50) {
    const m = s.length >> 1;
    return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
  }
  const rank = Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1));
  return s[rank];
}

/** Rounds for the table: 3 significant digits, whole numbers from 100 up. */
export function round(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (Math.abs(value) >= 100) return Math.round(value).toLocaleString('en-GB');
  return Number(value.toPrecision(3)).toString();
}

/** The results file: the figures of the run recorded with `npm run bench -- --record`. */
export const RESULTS_FILE = path.join(import.meta.dirname, 'results.json');

/** What results.json holds. */
export interface RecordedRun {
  recordedAt: string;
  machine: string;
  /** The commit the server part compared with (full hash). */
  baseline?: string;
  figures: Record<string, { value: number; unit: string }>;
}

/** Reads the recorded run (null when there is none yet). */
export function readRecorded(file = RESULTS_FILE): RecordedRun | null {
  try {
    return JSON.parse(fs.readFileSync(file, 'utf8')) as RecordedRun;
  } catch {
    return null;
  }
}

/**
 * Figures more than `factor` times worse than the recorded ones.
 * @returns one line per regression, naming the figure, the recorded and the new value
 */
export function regressions(figures: Figure[], recorded: RecordedRun | null, factor = 2): string[] {
  if (!recorded) return [];
  const out: string[] = [];
  for (const f of figures) {
    const before = recorded.figures[f.id];
    if (!before || !Number.isFinite(before.value) || !Number.isFinite(f.value) || before.value <= 0 || f.value <= 0) continue;
    const worse = f.better === 'lower' ? f.value / before.value : before.value / f.value;
    if (worse > factor)
      out.push(`${f.label}: ${round(f.value)} ${f.unit} now, ${round(before.value)} ${before.unit} recorded (${worse.toFixed(1)}× worse)`);
  }
  return out;
}

/** The table `npm run bench` prints. */
export function formatTable(figures: Figure[]): string {
  const rows = figures.map((f) => [
    f.label,
    f.target,
    `${round(f.value)} ${f.unit}`.trim(),
    f.ratio === null ? '–' : f.ratio.toFixed(2),
    f.ok === null ? 'info' : f.ok ? 'ok' : 'warn',
  ]);
  const head = ['figure', 'target', 'measured', 'ratio', ''];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
  return [line(head), `|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`, ...rows.map(line)].join('\n');
}

let baselineOfRun: string | undefined;

/** Notes the baseline commit of this run, recorded with it. */
export function setRecordedBaseline(commit: string): void {
  baselineOfRun = commit;
}

/** Writes the run as the new recorded one. */
export function record(figures: Figure[], machine: string, file = RESULTS_FILE): void {
  const run: RecordedRun = {
    recordedAt: new Date().toISOString(),
    machine,
    baseline: baselineOfRun ?? readRecorded(file)?.baseline,
    figures: Object.fromEntries(figures.map((f) => [f.id, { value: Number(f.value.toPrecision(4)), unit: f.unit }])),
  };
  fs.writeFileSync(file, `${JSON.stringify(run, null, 2)}\n`);
}

/** Progress lines go to stderr so that stdout carries the table only. */
export const say = (line: string): void => void process.stderr.write(`${line}\n`);

export const sleep = (ms: number): Promise<void> => new Promise((resolve) => setTimeout(resolve, ms));
