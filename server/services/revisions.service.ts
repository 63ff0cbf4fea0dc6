import { createHash } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { EngineInputError, evaluateValidDesign, safeParseDesign, slowestDirection, type DesignInput, type DesignResult } from '@/engine';
import { getSequelize } from '../db';
import { AppError, conflict, forbidden, notFound, validationError, type ErrorDetail } from '../errors';
import {
  Design,
  Revision,
  Sheet,
  User,
  type DesignMechanism,
  type DesignStatus,
  type RevisionStatus,
  type RevisionSummaryFigures,
} from '../models';
import { freezeInPool } from '../workers/pool';
import { isUnitSystem, type QuantityKey, type UnitSystem } from '@/format';
import { recordAudit } from './audit.service';
import { deliverSoon, queueMail, submittedMail } from './notify.service';
import { findActiveUsersByRole, type Page, type PublicUser } from './users.service';

/**
 * Revisions: submitting a design freezes it (inputs, full engine result, engine version, fingerprint), the
 * designer may withdraw it, and reading revisions, their history and their diff. The reviewer's decisions
 * (comments, approve, return) live in reviews.service.ts.
 *
 * Who may read a revision: reviewers, admins, the design's owner and the revision's author always; everyone
 * else (makers, other designers) only once it is approved. Revisions are never modified through the API.
 */

/** Someone named in an answer. */
export type PersonRef = { id: number; name: string };

/** A revision in lists: no inputs or result, a few frozen figures instead. */
export type RevisionListItem = {
  id: number;
  designId: number;
  number: number;
  status: RevisionStatus;
  /** The design's name as frozen in this revision. */
  name: string;
  mechanism: DesignMechanism;
  design: { id: number; name: string; status: DesignStatus; owner: PersonRef };
  author: PersonRef;
  submittedAt: string;
  decidedBy: PersonRef | null;
  decidedAt: string | null;
  /** Why it was returned (status `returned`), else null. */
  returnReason: string | null;
  /** The reviewer's comment on approval (status `approved`), else null. */
  approvalComment: string | null;
  /** Why the reviewer approved although a check failed (approved with failures only), else null. */
  approvalJustification: string | null;
  /** Unit system the design sheet is printed in (chosen by the designer at submission). */
  sheetUnits: UnitSystem;
  sheetId: number | null;
  engineVersion: string;
  fingerprint: string;
  summary: RevisionSummaryFigures;
  /** The signed-in user authored it or owns the design: they cannot approve or return it. */
  isOwn: boolean;
};

/** One revision with its frozen inputs and result, and what the signed-in user may do with it. */
export type RevisionDetail = RevisionListItem & {
  inputs: DesignInput;
  result: DesignResult;
  previousRevisionId: number | null;
  permissions: { canDecide: boolean; canComment: boolean; canWithdraw: boolean };
};

type RevisionRow = Revision & {
  design?: Design & { owner?: User | null };
  author?: User | null;
  decidedBy?: User | null;
  sheet?: Sheet | null;
};

export const isAdmin = (actor: PublicUser): boolean => actor.roles.includes('admin');
/** Reviewers and admins review. */
export const isReviewer = (actor: PublicUser): boolean => isAdmin(actor) || actor.roles.includes('reviewer');

/** Labels of states in messages. */
const STATE_WORDS: Record<string, string> = {
  draft: 'a draft',
  in_review: 'in review',
  approved: 'approved',
  returned: 'returned',
  withdrawn: 'withdrawn',
};
export const stateWord = (status: string): string => STATE_WORDS[status] ?? status;

export function parseJson<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T;
}

/**
 * Canonical JSON: object keys sorted at every level, no whitespace, arrays in order, numbers as JSON.stringify
 * writes them (non-finite numbers become null, as in any JSON). Equal data gives equal text.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    const text = JSON.stringify(value);
    return text === undefined ? 'null' : text;
  }
  if (Array.isArray(value))
    return `[${value.map((v) => (v === undefined || typeof v === 'function' ? 'null' : canonicalJson(v))).join(',')}]`;
  const entries = Object.keys(value as Record<string, unknown>)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined && typeof (value as Record<string, unknown>)[k] !== 'function')
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`);
  return `{${entries.join(',')}}`;
}

/** The fingerprint of a revision: SHA-256 (hex) of the canonical JSON of `{ inputs, result }`. */
export function revisionFingerprint(inputs: unknown, result: unknown): string {
  return createHash('sha256').update(canonicalJson({ inputs, result }), 'utf8').digest('hex');
}

/** The list figures of a result. */
export function summaryFigures(result: DesignResult): RevisionSummaryFigures {
  const checks = { ok: 0, warn: 0, fail: 0 };
  for (const check of result.checks) checks[check.severity] += 1;
  return {
    checks,
    stepsPerMm: result.drive.stepsPerMm,
    travel: { xMm: result.travel.xMm, yMm: result.travel.yMm },
    worstAccelMPerS2: result.envelope.axes.worst.accelMaxMPerS2,
    lowestFrequencyHz: result.stiffness.min.frequencyHz,
  };
}

const person = (user: User | null | undefined, fallbackId: number | null = null): PersonRef | null =>
  user ? { id: user.id, name: user.name } : fallbackId === null ? null : { id: fallbackId, name: '' };

/** True when `actor` wrote the revision or owns its design ("own work"). */
export function isOwnWork(actor: PublicUser, revision: Pick<Revision, 'authorId'>, design: Pick<Design, 'ownerId'>): boolean {
  return revision.authorId === actor.id || design.ownerId === actor.id;
}

/** Whether `actor` may read this revision (see the module comment). */
export function mayReadRevision(
  actor: PublicUser,
  revision: Pick<Revision, 'authorId' | 'status'>,
  design: Pick<Design, 'ownerId'>,
): boolean {
  if (isReviewer(actor) || isOwnWork(actor, revision, design)) return true;
  return revision.status === 'approved' && actor.roles.length > 0;
}

/** 403 unless `actor` may read the revision. */
export function assertMayReadRevision(actor: PublicUser, revision: RevisionRow, design: Design): void {
  if (!mayReadRevision(actor, revision, design)) {
    throw forbidden('Only reviewers, admins and the design’s owner can read a revision before it is approved.');
  }
}

const LIST_INCLUDE = [
  {
    model: Design,
    as: 'design',
    attributes: ['id', 'name', 'status', 'ownerId', 'mechanism'],
    include: [{ model: User, as: 'owner', attributes: ['id', 'name'] }],
  },
  { model: User, as: 'author', attributes: ['id', 'name'] },
  { model: User, as: 'decidedBy', attributes: ['id', 'name'] },
  { model: Sheet, as: 'sheet', attributes: ['id'] },
];

function toListItem(row: RevisionRow, actor: PublicUser): RevisionListItem {
  const design = row.design!;
  const inputs = parseJson<{ name?: string; mechanism?: DesignMechanism }>(row.inputs);
  return {
    id: row.id,
    designId: row.designId,
    number: row.number,
    status: row.status,
    name: inputs.name ?? design.name,
    mechanism: inputs.mechanism ?? design.mechanism,
    design: { id: design.id, name: design.name, status: design.status as DesignStatus, owner: person(design.owner, design.ownerId)! },
    author: person(row.author, row.authorId)!,
    submittedAt: new Date(row.submittedAt).toISOString(),
    decidedBy: person(row.decidedBy, row.decidedById),
    decidedAt: row.decidedAt ? new Date(row.decidedAt).toISOString() : null,
    returnReason: row.status === 'returned' ? row.decisionNote : null,
    approvalComment: row.status === 'approved' ? (row.decisionNote ?? '') : null,
    approvalJustification: row.status === 'approved' ? (row.approvalJustification ?? null) : null,
    sheetUnits: isUnitSystem(row.sheetUnits) ? row.sheetUnits : 'metric',
    sheetId: row.sheet?.id ?? null,
    engineVersion: row.engineVersion,
    fingerprint: row.fingerprint,
    summary: parseJson<RevisionSummaryFigures>(row.summary),
    isOwn: isOwnWork(actor, row, design),
  };
}

/**
 * Loads a revision with its design (and owner), author, decider and sheet id.
 * @param withResult - also load the frozen result (~100 kB)
 */
export async function findRevision(
  id: number,
  options: { withResult?: boolean; transaction?: Transaction; lock?: boolean } = {},
): Promise<RevisionRow & { design: Design & { owner?: User | null } }> {
  const row = (await Revision.findByPk(id, {
    attributes: options.withResult ? undefined : { exclude: ['result'] },
    include: LIST_INCLUDE,
    transaction: options.transaction,
  })) as RevisionRow | null;
  if (!row || !row.design) throw notFound('Revision');
  return row as RevisionRow & { design: Design & { owner?: User | null } };
}

/** One revision with its frozen inputs and result. 403 for those who may not read it yet. */
export async function getRevision(actor: PublicUser, id: number): Promise<RevisionDetail> {
  const row = await findRevision(id, { withResult: true });
  assertMayReadRevision(actor, row, row.design);
  const previous = await Revision.findOne({
    where: { designId: row.designId, number: { [Op.lt]: row.number } },
    attributes: ['id'],
    order: [['number', 'DESC']],
  });
  const item = toListItem(row, actor);
  const mayChange = isAdmin(actor) || (actor.roles.includes('designer') && row.design.ownerId === actor.id);
  return {
    ...item,
    inputs: parseJson<DesignInput>(row.inputs),
    result: parseJson<DesignResult>(row.result),
    previousRevisionId: previous?.id ?? null,
    permissions: {
      canDecide: row.status === 'in_review' && isReviewer(actor) && !item.isOwn,
      canComment: mayComment(actor, row, row.design),
      canWithdraw: row.status === 'in_review' && mayChange,
    },
  };
}

/** Whether `actor` may take part in the discussion: reviewers, admins, the owner and the author. */
export function mayComment(actor: PublicUser, revision: Pick<Revision, 'authorId'>, design: Pick<Design, 'ownerId'>): boolean {
  return isReviewer(actor) || isOwnWork(actor, revision, design);
}

/**
 * Lists revisions for the review desk (reviewers and admins): by default those waiting, oldest first.
 * @param query - status filter (one or more), optional design, paging
 */
export async function listRevisions(
  actor: PublicUser,
  query: { status?: RevisionStatus[]; designId?: number; page: number; pageSize: number },
): Promise<Page<RevisionListItem>> {
  const where: Record<string, unknown> = {};
  if (query.status?.length) where.status = { [Op.in]: query.status };
  if (query.designId !== undefined) where.designId = query.designId;
  const { rows, count } = await Revision.findAndCountAll({
    where,
    attributes: { exclude: ['result'] },
    include: LIST_INCLUDE,
    order: [
      ['submittedAt', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
    distinct: true,
  });
  return { items: (rows as RevisionRow[]).map((row) => toListItem(row, actor)), total: count, page: query.page, pageSize: query.pageSize };
}

/**
 * The revision history of one design, newest first: each revision's status, return reason or approval comment
 * and sheet. Every team member may ask; revisions they may not read yet are left out.
 */
export async function listDesignRevisions(actor: PublicUser, designId: number): Promise<Page<RevisionListItem>> {
  const design = await Design.findByPk(designId, { attributes: ['id', 'ownerId'] });
  if (!design) throw notFound('Design');
  const rows = (await Revision.findAll({
    where: { designId },
    attributes: { exclude: ['result'] },
    include: LIST_INCLUDE,
    order: [['number', 'DESC']],
  })) as RevisionRow[];
  const items = rows.filter((row) => mayReadRevision(actor, row, design)).map((row) => toListItem(row, actor));
  return { items, total: items.length, page: 1, pageSize: Math.max(items.length, 1) };
}

// ---------------------------------------------------------------------------------------------------------
// Diff against the previous revision of the same design.

/** One input that differs; `old` is null for a new path (and for every path of a first revision). */
export type InputChange = { path: string; change: 'added' | 'removed' | 'changed'; old: unknown; new: unknown };
/**
 * One key result, old and new. `unit` names the stored unit for programs; `quantity` and `stored` let a reader's
 * client show the numbers in their unit system (format layer, `@/format`).
 */
export type ResultChange = {
  key: string;
  label: string;
  unit: string;
  quantity: QuantityKey | null;
  stored: string;
  old: number | null;
  new: number | null;
  isChanged: boolean;
};
/** The answer of GET /api/revisions/:id/diff. */
export type RevisionDiff = {
  revisionId: number;
  number: number;
  /** Engine that computed this revision's frozen result. */
  engineVersion: string;
  previous: { id: number; number: number; status: RevisionStatus; engineVersion: string } | null;
  /** Changed inputs only (all inputs, as `added`, for a first revision). */
  inputs: InputChange[];
  /** Every key result, with `isChanged` marking those that moved. */
  results: ResultChange[];
};

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

/**
 * What changed since the previous revision of the same design (whatever its state): changed inputs by path and
 * key results old → new. A first revision lists every input as added and every result as new.
 */
export async function getRevisionDiff(actor: PublicUser, id: number): Promise<RevisionDiff> {
  const row = await findRevision(id, { withResult: true });
  assertMayReadRevision(actor, row, row.design);
  const previous = await Revision.findOne({
    where: { designId: row.designId, number: { [Op.lt]: row.number } },
    order: [['number', 'DESC']],
  });
  const inputs = parseJson<unknown>(row.inputs);
  const result = parseJson<DesignResult>(row.result);
  return {
    revisionId: row.id,
    number: row.number,
    engineVersion: row.engineVersion,
    previous: previous
      ? { id: previous.id, number: previous.number, status: previous.status, engineVersion: previous.engineVersion }
      : null,
    inputs: diffInputs(previous ? parseJson<unknown>(previous.inputs) : null, inputs),
    results: diffKeyResults(previous ? parseJson<DesignResult>(previous.result) : null, result),
  };
}

// ---------------------------------------------------------------------------------------------------------
// Transitions started by the designer: submit, withdraw, reopen.

/** MariaDB's answer to `FOR UPDATE NOWAIT` when another transaction holds the row. */
const ER_LOCK_WAIT_TIMEOUT = 1205;

/**
 * Locks a design row for a transition, without waiting: when another request holds it (a concurrent submit,
 * approval, withdrawal …) this one is refused at once with 409 `busy` instead of queueing behind it while holding a
 * pooled connection (issue 12, item 2: 12 concurrent submits of one draft stalled the whole app for 20 s).
 * @throws 404 when the design does not exist, 409 `busy` when it is locked
 */
async function lockDesign(id: number, transaction: Transaction): Promise<Design> {
  try {
    await getSequelize().query('SELECT id FROM designs WHERE id = ? FOR UPDATE NOWAIT', { replacements: [id], transaction });
  } catch (err) {
    const errno = (err as { parent?: { errno?: number } }).parent?.errno;
    if (errno === ER_LOCK_WAIT_TIMEOUT) {
      throw conflict('Someone else is changing this design right now. Reload it to see what changed, then try again.', 'busy');
    }
    throw err;
  }
  // The row is ours now: this read sees its latest committed state.
  const design = await Design.findByPk(id, { transaction });
  if (!design) throw notFound('Design');
  return design;
}

function assertOwnerOrAdmin(actor: PublicUser, design: Design, what: string): void {
  const isOwnerDesigner = design.ownerId === actor.id && actor.roles.includes('designer');
  if (!isAdmin(actor) && !isOwnerDesigner) throw forbidden(`Only the owner of this design or an admin can ${what} it.`);
}

function engineIssues(issues: { path: string; message: string }[]): ErrorDetail[] {
  return issues.map((i) => ({ path: ['inputs', i.path].filter(Boolean).join('.'), message: i.message }));
}

/**
 * Validates stored inputs and runs the engine on them: the content of a new revision (pure; also used by the demo
 * seeder). @throws AppError 400 with the paths of invalid inputs
 */
export function freezeDesign(storedInputs: unknown): {
  inputs: DesignInput;
  result: DesignResult;
  fingerprint: string;
  summary: RevisionSummaryFigures;
} {
  const parsed = safeParseDesign(parseJson(storedInputs));
  if (!parsed.ok)
    throw validationError(engineIssues(parsed.issues), 'The design is not valid; fix the marked inputs before submitting it.');
  let result: DesignResult;
  try {
    result = evaluateValidDesign(parsed.value);
  } catch (err) {
    if (err instanceof EngineInputError)
      throw validationError(engineIssues(err.issues), 'The design is not valid; fix the marked inputs before submitting it.');
    throw err;
  }
  // Freeze what the database will hand back: a JSON round trip turns non-finite numbers into null, so the
  // fingerprint computed now equals the one recomputed from the stored row.
  const frozen = JSON.parse(JSON.stringify({ inputs: parsed.value, result })) as { inputs: DesignInput; result: DesignResult };
  return { ...frozen, fingerprint: revisionFingerprint(frozen.inputs, frozen.result), summary: summaryFigures(frozen.result) };
}

/**
 * Submits a design for review: freezes a new revision (numbered 1, 2, … per design) of the stored inputs with the
 * full engine result, moves the design to In review, logs both and e-mails every reviewer except the author.
 * Owner (designer) or admin; the design must be a draft or returned; `version`, when given, must be the stored one.
 * The design row is locked first without waiting and every query runs in that one transaction, so concurrent submits
 * of one design get 409 `busy` at once instead of stalling the connection pool.
 * @throws 403 for others, 409 `invalid_state` / `version_conflict` / `busy`, 400 when the inputs do not validate
 */
export async function submitDesign(
  actor: PublicUser,
  designId: number,
  body: { version?: number; sheetUnits?: UnitSystem } = {},
): Promise<RevisionDetail> {
  const { revisionId, mailIds } = await getSequelize().transaction(async (transaction) => {
    const design = await lockDesign(designId, transaction);
    assertOwnerOrAdmin(actor, design, 'submit');
    if (design.status !== 'draft' && design.status !== 'returned') {
      throw conflict(`This design is ${stateWord(design.status)}; only a draft or a returned design can be submitted.`, 'invalid_state');
    }
    if (body.version !== undefined && body.version !== design.version) {
      throw new AppError(
        'version_conflict',
        `This design was saved again since you opened it (now version ${design.version}). Reload it, check it, then submit.`,
        409,
      );
    }
    const frozen = await freezeInPool(design.inputs);
    const last = (await Revision.max<number | null, Revision>('number', { where: { designId }, transaction })) ?? 0;
    const revision = await Revision.create(
      {
        designId,
        number: last + 1,
        status: 'in_review',
        inputs: frozen.inputs as unknown as Record<string, unknown>,
        result: frozen.result as unknown as Record<string, unknown>,
        summary: frozen.summary,
        engineVersion: frozen.result.engineVersion,
        fingerprint: frozen.fingerprint,
        authorId: actor.id,
        submittedAt: new Date(),
        decidedById: null,
        decidedAt: null,
        decisionNote: null,
        sheetUnits: body.sheetUnits ?? 'metric',
      },
      { transaction },
    );
    const from = design.status;
    await design.update({ status: 'in_review' }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.submit',
        entity: 'design',
        entityId: designId,
        fromState: from,
        toState: 'in_review',
        reason: `Submitted revision ${revision.number}`,
      },
      transaction,
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'revision.submit',
        entity: 'revision',
        entityId: revision.id,
        fromState: null,
        toState: 'in_review',
        reason: `Revision ${revision.number} of design ${designId}, fingerprint ${frozen.fingerprint}`,
      },
      transaction,
    );

    const reviewers = (await findActiveUsersByRole('reviewer', transaction)).filter((u) => u.id !== actor.id && u.id !== design.ownerId);
    const ref = {
      revisionId: revision.id,
      number: revision.number,
      designId,
      designName: frozen.inputs.name,
      authorName: actor.name,
      checks: frozen.summary.checks,
    };
    const ids = await queueMail('revision.submitted', reviewers, (to) => submittedMail(to, ref), transaction);
    return { revisionId: revision.id, mailIds: ids };
  });
  deliverSoon(mailIds);
  return getRevision(actor, revisionId);
}

/**
 * Withdraws the revision in review: it becomes `withdrawn` and the design a draft again. Owner or admin.
 * @throws 403 for others, 409 when the design is not in review
 */
export async function withdrawDesign(actor: PublicUser, designId: number): Promise<RevisionDetail> {
  const revisionId = await getSequelize().transaction(async (transaction) => {
    const design = await lockDesign(designId, transaction);
    assertOwnerOrAdmin(actor, design, 'withdraw');
    if (design.status !== 'in_review')
      throw conflict(`This design is ${stateWord(design.status)}, not in review; there is nothing to withdraw.`, 'invalid_state');
    const revision = await Revision.findOne({
      where: { designId, status: 'in_review' },
      order: [['number', 'DESC']],
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!revision) throw conflict('No revision of this design is in review.', 'invalid_state');
    await revision.update({ status: 'withdrawn', decidedById: actor.id, decidedAt: new Date(), decisionNote: null }, { transaction });
    await design.update({ status: 'draft' }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.withdraw',
        entity: 'design',
        entityId: designId,
        fromState: 'in_review',
        toState: 'draft',
        reason: `Withdrew revision ${revision.number}`,
      },
      transaction,
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'revision.withdraw',
        entity: 'revision',
        entityId: revision.id,
        fromState: 'in_review',
        toState: 'withdrawn',
      },
      transaction,
    );
    return revision.id;
  });
  return getRevision(actor, revisionId);
}

/**
 * Reopens an approved design as a draft, to make a new revision; its approved revisions and sheets stay as they
 * are (a later approval marks the earlier sheet superseded). Owner or admin.
 * @throws 403 for others, 409 unless the design is approved
 */
export async function reopenDesign(actor: PublicUser, designId: number): Promise<{ id: number; status: DesignStatus }> {
  await getSequelize().transaction(async (transaction) => {
    const design = await lockDesign(designId, transaction);
    assertOwnerOrAdmin(actor, design, 'reopen');
    if (design.status !== 'approved')
      throw conflict(
        `This design is ${stateWord(design.status)}; only an approved design can be reopened for a new revision.`,
        'invalid_state',
      );
    await design.update({ status: 'draft' }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.reopen',
        entity: 'design',
        entityId: designId,
        fromState: 'approved',
        toState: 'draft',
        reason: 'Reopened for a new revision',
      },
      transaction,
    );
  });
  return { id: designId, status: 'draft' };
}

/** Exposed for reviews.service: locks a design row in a transaction. */
export { lockDesign };
