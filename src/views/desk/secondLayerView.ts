import type { DesignResult, ErrorTerm, JobResult, ModeId } from '@/engine';

/**
 * Pure helpers that turn the second-layer sections of an engine result into rows and series for the Design desk's
 * Error budget, Modes & shaping, Drive & loads and Job timing tabs. The numbers all come from the engine; these only
 * pick, order and label them.
 */

/** Plain words for each error term. */
export const ERROR_TERM_LABELS: Record<ErrorTerm, { label: string; what: string }> = {
  stretch: { label: 'Belt stretch', what: 'The belts stretch under the force that accelerates the carriage and overcomes friction.' },
  loadAngle: {
    label: 'Motor load angle',
    what: 'The rotors lag their commanded position under load (the holding stiffness of the motors).',
  },
  deadband: {
    label: 'Microstep deadband',
    what: 'Friction holds the rotor until the field leads it far enough: rest positions spread over a band.',
  },
  runout: { label: 'Pulley runout', what: 'An eccentric drive pulley lets the belt lead and lag once per turn.' },
};

/** One row of the error table at the worst point. */
export interface ErrorRow {
  term: ErrorTerm;
  label: string;
  what: string;
  valueMm: number;
  /** Share of the total [0 … 1]. */
  share: number;
  isBiggest: boolean;
}

/**
 * The four terms at the worst point, in budget order, with their share of the total.
 * @param budget - the result's error budget
 */
export function errorRows(budget: DesignResult['errorBudget']): ErrorRow[] {
  const w = budget.worst;
  const values: Record<ErrorTerm, number> = { stretch: w.stretchMm, loadAngle: w.loadAngleMm, deadband: w.deadbandMm, runout: w.runoutMm };
  return (Object.keys(values) as ErrorTerm[]).map((term) => ({
    term,
    ...ERROR_TERM_LABELS[term],
    valueMm: values[term],
    share: w.totalMm > 0 ? values[term] / w.totalMm : 0,
    isBiggest: budget.biggest.term === term,
  }));
}

/** Short names of the modes for plots and tables. */
export const MODE_SHORT: Record<ModeId, string> = {
  belt: 'Belt',
  'gantry-bending': 'Beam bending',
  'gantry-yaw': 'Gantry yaw',
  'cross-shaft': 'Yaw through cross shaft',
};

/**
 * Hover text of the lowest-mode map: which mode is lowest at each point.
 * @param ids - mode id per point [iy][ix]
 */
export function modeNamesGrid(ids: ModeId[][]): string[][] {
  return ids.map((row) => row.map((id) => MODE_SHORT[id] ?? id));
}

/** A horizontal band of the tooth-mesh plot. */
export interface MeshBand {
  label: string;
  kind: 'mode' | 'span';
  minHz: number;
  maxHz: number;
}

/**
 * What the tooth-mesh plot draws: the mesh line over the belt-speed range, the bands it may meet (capped to the
 * plot's height) and a marker where it enters each band it reaches.
 * @param e - the result's excitation section
 * @param pitchMm - belt pitch [mm]
 * @returns line [m/s, Hz], bands [Hz], crossing markers [m/s, Hz]
 */
export function meshPlot(
  e: DesignResult['excitation'],
  pitchMm: number,
): {
  line: { speedMPerS: number[]; frequencyHz: number[] };
  bands: MeshBand[];
  markers: { speedMPerS: number; frequencyHz: number; label: string }[];
  topHz: number;
} {
  const top = e.beltSpeedAtTopMPerS;
  const topHz = (top / pitchMm) * 1000;
  const ceiling = topHz * 1.15;
  const bands = e.targets
    .filter((t) => t.minHz <= ceiling)
    .map((t) => ({ label: t.label, kind: t.kind, minHz: t.minHz, maxHz: Math.min(t.maxHz, ceiling) }));
  const markers = e.crossings.map((c) => ({
    speedMPerS: c.fromBeltSpeedMPerS,
    frequencyHz: (c.fromBeltSpeedMPerS / pitchMm) * 1000,
    label: c.label,
  }));
  return { line: { speedMPerS: [0, top], frequencyHz: [0, topHz] }, bands, markers, topHz: ceiling };
}

/** The job's path as two sets of segments: the slowest moves and the rest (plotly lines with gaps). */
export function jobPathSegments(
  points: { xMm: number; yMm: number }[],
  job: JobResult,
): { normal: { x: (number | null)[]; y: (number | null)[] }; slow: { x: (number | null)[]; y: (number | null)[]; labels: string[] } } {
  const slow = new Set(job.slowest);
  const normal = { x: [] as (number | null)[], y: [] as (number | null)[] };
  const slowSeg = { x: [] as (number | null)[], y: [] as (number | null)[], labels: [] as string[] };
  job.moves.forEach((m, i) => {
    const a = points[m.fromIndex];
    const b = points[m.toIndex];
    if (!a || !b) return;
    const target = slow.has(i) ? slowSeg : normal;
    target.x.push(a.xMm, b.xMm, null);
    target.y.push(a.yMm, b.yMm, null);
    if (slow.has(i)) slowSeg.labels.push(`${m.fromIndex + 1} → ${m.toIndex + 1}`);
  });
  return { normal, slow: slowSeg };
}

/** Load rows for the shaft-load table, most loaded first, with the share of the rating. */
export function loadRows(loads: DesignResult['loads']): (DesignResult['loads']['pulleys'][number] & { share: number })[] {
  return loads.pulleys.map((p) => ({ ...p, share: p.ratingN > 0 ? p.atPeakN / p.ratingN : 0 })).sort((a, b) => b.share - a.share);
}

/** One editable job point as the editor shows it (dwell always present). */
export interface JobPointRow {
  xMm: number | null;
  yMm: number | null;
  dwellS: number | null;
}

/**
 * The job points of a design being edited, whatever half-typed state they are in.
 * @param job - the document's `job` (may be null or partly typed)
 */
export function jobRows(job: unknown): JobPointRow[] {
  const points = (job as { points?: unknown } | null)?.points;
  if (!Array.isArray(points)) return [];
  const num = (v: unknown): number | null => (typeof v === 'number' ? v : null);
  return points.map((p) => {
    const o = (p ?? {}) as Record<string, unknown>;
    return { xMm: num(o.xMm), yMm: num(o.yMm), dwellS: num(o.dwellS) ?? 0 };
  });
}
