import { slowestDirection, type DesignResult } from '@/engine';
import type { QuantityKey } from '@/format';
import type { InputChange, ResultChange } from '@/contracts';
import { canonicalJson } from './revisionFingerprint';

// The diff engine behind GET /api/revisions/:id/diff: changed inputs by dotted path, and the key results of two
// frozen results side by side. Pure: the service loads the two revisions and hands their JSON here.

/** Flattens a document to leaf paths ("belt.pitchMm"); arrays are leaves (compared as a whole). */
export function flattenLeaves(value: unknown, prefix = '', out = new Map<string, unknown>()): Map<string, unknown> {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    const keys = Object.keys(value as Record<string, unknown>).sort();
    if (!keys.length && prefix) out.set(prefix, value);
    for (const key of keys) flattenLeaves((value as Record<string, unknown>)[key], prefix ? `${prefix}.${key}` : key, out);
  } else if (prefix) {
    out.set(prefix, value);
  }
  return out;
}

/** The changed leaves between two documents; with `before` null every leaf of `after` is `added`. */
export function diffInputs(before: unknown, after: unknown): InputChange[] {
  const a = before === null ? new Map<string, unknown>() : flattenLeaves(before);
  const b = flattenLeaves(after);
  const changes: InputChange[] = [];
  for (const [path, value] of b) {
    if (!a.has(path)) changes.push({ path, change: 'added', old: null, new: value });
    else if (canonicalJson(a.get(path)) !== canonicalJson(value)) changes.push({ path, change: 'changed', old: a.get(path), new: value });
  }
  for (const [path, value] of a) if (!b.has(path)) changes.push({ path, change: 'removed', old: value, new: null });
  return changes.map(summariseJobPoints).sort((x, y) => x.path.localeCompare(y.path));
}

/** A job's point list (up to 1000 points) is compared whole but shown as its size, so the diff stays readable. */
function summariseJobPoints(c: InputChange): InputChange {
  if (c.path !== 'job.points') return c;
  const words = (v: unknown) => (Array.isArray(v) ? `${v.length} point${v.length === 1 ? '' : 's'}` : v);
  const same = Array.isArray(c.old) && Array.isArray(c.new) && c.old.length === c.new.length;
  return { ...c, old: words(c.old), new: same ? `${words(c.new)}, moved` : words(c.new) };
}

type KeyResult = {
  key: string;
  label: string;
  unit: string;
  quantity: QuantityKey | null;
  stored: string;
  get: (r: DesignResult) => number | null | undefined;
};

/** Display quantity and stored (mathjs) unit of each unit string the key results use. */
const UNIT_DISPLAY: Record<string, { quantity: QuantityKey | null; stored: string }> = {
  'steps/mm': { quantity: 'perLength', stored: 'mm^-1' },
  mm: { quantity: 'length', stored: 'mm' },
  kg: { quantity: 'mass', stored: 'kg' },
  'm/s²': { quantity: 'accel', stored: 'm/s^2' },
  'm/s': { quantity: 'speed', stored: 'm/s' },
  Hz: { quantity: 'frequency', stored: 'Hz' },
  'N·m': { quantity: 'moment', stored: 'N m' },
  N: { quantity: 'force', stored: 'N' },
  W: { quantity: 'power', stored: 'W' },
  s: { quantity: 'time', stored: 's' },
  '': { quantity: null, stored: '' },
};

/**
 * A key result row: label, stored unit and how people read it. `shownAs` overrides the quantity the unit implies:
 * fine lengths (microsteps, ringing, error budget) read in µm / thou, shaper delays in ms.
 */
function keyResult(key: string, label: string, unit: string, get: KeyResult['get'], shownAs?: QuantityKey): KeyResult {
  const display = UNIT_DISPLAY[unit] ?? { quantity: null, stored: '' };
  return { key, label, unit, ...display, ...(shownAs ? { quantity: shownAs } : {}), get };
}

const KEY_RESULTS: KeyResult[] = [
  keyResult('drive.stepsPerMm', 'Steps per mm of belt', 'steps/mm', (r) => r.drive.stepsPerMm),
  keyResult('drive.travelPerRevMm', 'Belt travel per motor revolution', 'mm', (r) => r.drive.travelPerRevMm),
  keyResult(
    'drive.microstep.oneMotorMm',
    'Carriage move, one motor one microstep',
    'mm',
    (r) => r.drive.microstep.oneMotorMm,
    'lengthFine',
  ),
  keyResult('drive.microstep.axisMm', 'Smallest pure X or Y move', 'mm', (r) => r.drive.microstep.axisMm, 'lengthFine'),
  keyResult('drive.microstep.diagonalMm', 'Smallest pure diagonal move', 'mm', (r) => r.drive.microstep.diagonalMm, 'lengthFine'),
  keyResult('travel.xMm', 'Usable travel X', 'mm', (r) => r.travel.xMm),
  keyResult('travel.yMm', 'Usable travel Y', 'mm', (r) => r.travel.yMm),
  keyResult('mass.xKg', 'Moving mass along X', 'kg', (r) => r.mass.xKg),
  keyResult('mass.yKg', 'Moving mass along Y', 'kg', (r) => r.mass.yKg),
  keyResult('envelope.axes.x.accelMaxMPerS2', 'Peak acceleration along X', 'm/s²', (r) => r.envelope.axes.x.accelMaxMPerS2),
  keyResult('envelope.axes.y.accelMaxMPerS2', 'Peak acceleration along Y', 'm/s²', (r) => r.envelope.axes.y.accelMaxMPerS2),
  keyResult(
    'envelope.axes.diagonal.accelMaxMPerS2',
    'Peak acceleration on the diagonal',
    'm/s²',
    (r) => r.envelope.axes.diagonal.accelMaxMPerS2,
  ),
  keyResult(
    'envelope.axes.worst.accelMaxMPerS2',
    'Peak acceleration, worst direction',
    'm/s²',
    (r) => r.envelope.axes.worst.accelMaxMPerS2,
  ),
  keyResult(
    'envelope.axes.worst.accelAtCruiseMPerS2',
    'Acceleration at cruise speed, worst direction',
    'm/s²',
    (r) => r.envelope.axes.worst.accelAtCruiseMPerS2,
  ),
  keyResult('envelope.axes.slowest.speedMaxMPerS', 'Top speed, worst direction', 'm/s', (r) => slowestDirection(r.envelope).speedMaxMPerS),
  keyResult('stiffness.min.frequencyHz', 'Lowest resonance', 'Hz', (r) => r.stiffness.min.frequencyHz),
  keyResult(
    'stiffness.ringing.planned.amplitudeMm',
    'Ringing at the planned acceleration',
    'mm',
    (r) => r.stiffness.ringing.planned.amplitudeMm,
    'lengthFine',
  ),
  keyResult('racking.peakMomentNm', 'Gantry racking moment (H loop)', 'N·m', (r) => r.racking.peakMomentNm),
  // The second layer (docs/models/); older revisions have none of these and show them as new.
  keyResult('errorBudget.worst.totalMm', 'Worst positioning error', 'mm', (r) => r.errorBudget.worst.totalMm, 'lengthFine'),
  keyResult('stiffness.lowest.frequencyHz', 'Lowest of all modes', 'Hz', (r) => r.stiffness.lowest.frequencyHz),
  keyResult('shaping.zvDurationS', 'Time a ZV shaper adds per move', 's', (r) => r.shaping.zvDurationS, 'timeShort'),
  keyResult(
    'excitation.microstepRateHzAtCruise',
    'Microstep rate at cruise, fastest motor',
    'Hz',
    (r) => r.excitation.microstepRateHzAtCruise,
  ),
  keyResult('heat.totalCopperLossW', 'Copper loss, all motors', 'W', (r) => r.heat.totalCopperLossW),
  keyResult('heat.supply.powerW', 'Supply power', 'W', (r) => r.heat.supply.powerW),
  keyResult('loads.motorShaftRadialN.atPeak', 'Motor shaft load at peak pull', 'N', (r) => r.loads.motorShaftRadialN.atPeak),
  keyResult('job.totalS', 'Job cycle time', 's', (r) => r.job?.totalS),
  keyResult('checks.fail', 'Failed checks', '', (r) => r.checks.filter((c) => c.severity === 'fail').length),
  keyResult('checks.warn', 'Warnings', '', (r) => r.checks.filter((c) => c.severity === 'warn').length),
];

/** Key results of two revisions side by side (belts matched by id; a belt only in one side shows null on the other). */
export function diffKeyResults(before: DesignResult | null, after: DesignResult): ResultChange[] {
  const rows: ResultChange[] = [];
  const num = (v: number | null | undefined): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
  const differs = (x: number | null, y: number | null) =>
    x === null || y === null ? x !== y : Math.abs(x - y) > 1e-9 * Math.max(1, Math.abs(x), Math.abs(y));
  const safe = (fn: () => number | null | undefined): number | null => {
    try {
      return num(fn());
    } catch {
      return null; // an older result without this figure
    }
  };
  for (const k of KEY_RESULTS) {
    const old = before ? safe(() => k.get(before)) : null;
    const now = safe(() => k.get(after));
    rows.push({
      key: k.key,
      label: k.label,
      unit: k.unit,
      quantity: k.quantity,
      stored: k.stored,
      old,
      new: now,
      isChanged: before === null || differs(old, now),
    });
  }
  const beltIds = [...new Set([...(before?.belts ?? []).map((b) => b.id), ...after.belts.map((b) => b.id)])];
  for (const id of beltIds) {
    const b0 = before?.belts.find((b) => b.id === id);
    const b1 = after.belts.find((b) => b.id === id);
    const label = b1?.label ?? b0?.label ?? id;
    // Belt figures; the tension ones exist from engine 2 on, so an older side shows null (not a recomputation).
    for (const [field, text, unit, pick] of [
      ['cutLengthMm', 'cut length', 'mm', (b: DesignResult['belts'][number]) => b.cutLengthMm],
      ['loopTeeth', 'teeth', '', (b: DesignResult['belts'][number]) => b.loopTeeth],
      ['tension.worstTightN', 'worst tight side', 'N', (b: DesignResult['belts'][number]) => b.tension?.worstTightN],
      ['tension.worstSlackN', 'worst slack side', 'N', (b: DesignResult['belts'][number]) => b.tension?.worstSlackN],
      ['tension.toothLoadN', 'load per tooth', 'N', (b: DesignResult['belts'][number]) => b.tension?.toothLoadN],
    ] as const) {
      const old = b0 ? num(pick(b0)) : null;
      const now = b1 ? num(pick(b1)) : null;
      rows.push({
        key: `belts.${id}.${field}`,
        label: `${label}: ${text}`,
        unit,
        ...(UNIT_DISPLAY[unit] ?? { quantity: null, stored: '' }),
        old,
        new: now,
        isChanged: before === null || differs(old, now),
      });
    }
  }
  return rows;
}
