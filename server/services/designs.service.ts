import { literal, Op, type Order, type Transaction, type WhereOptions } from 'sequelize';
import {
  defaultDesign,
  EngineInputError,
  evaluateValidDesign,
  safeParseDesign,
  slowestDirection,
  type DesignInput,
  type DesignResult,
} from '@/engine';
import { AppError, conflict, notFound, validationError, type ErrorDetail } from '../errors';
import { getSequelize } from '../db';
import {
  EDITABLE_DESIGN_STATUSES,
  type CreateDesignRequest,
  type DesignDetail,
  type DesignListItem,
  type DesignListRequest,
  type DesignResultSummary,
  type Page,
  type UpdateDesignRequest,
  type VersionConflictDetails,
} from '@/contracts';
import { Attachment, Design, Revision, User, type DesignStatus } from '../models';
import { removeUnreferencedBytes } from './fileStore.service';
import { parseJson } from './storedJson';
import { storedResultsInPool } from '../workers/pool';
import { recordAudit } from './audit.service';
import {
  assertMayChangeDesign,
  assertMayReadDesign,
  DELETABLE_DESIGN_STATUSES,
  designEditable,
  designReadNeedsAuthor,
  mayDeleteDesign,
  mayReadDesign,
} from './access';
import type { PublicUser } from './users.service';

type DesignRow = Design & { owner?: User | null; updatedBy?: User | null };

/** @param canOpen - whether `actor` may read the design (access.ts, mayReadDesign), decided by the caller */
function toListItem(row: DesignRow, actor: PublicUser, canOpen: boolean): DesignListItem {
  const status = row.status as DesignStatus;
  return {
    id: row.id,
    name: row.name,
    mechanism: row.mechanism,
    status,
    owner: { id: row.ownerId, name: row.owner?.name ?? '' },
    travel: { xMm: Number(row.travelXMm), yMm: Number(row.travelYMm) },
    version: row.version,
    updatedAt: new Date(row.updatedAt).toISOString(),
    createdAt: new Date(row.createdAt).toISOString(),
    canOpen,
    canEdit: designEditable(actor, { ownerId: row.ownerId, status }).ok,
    canDelete: mayDeleteDesign(actor, { ownerId: row.ownerId, status }),
  };
}

/** A design with its inputs, for someone who has been allowed to read it. */
function toDetail(row: DesignRow, actor: PublicUser): DesignDetail {
  return {
    ...toListItem(row, actor, true),
    inputs: parseJson<DesignInput>(row.inputs),
    editable: designEditable(actor, { ownerId: row.ownerId, status: row.status as DesignStatus }),
    updatedBy: row.updatedBy ? { id: row.updatedBy.id, name: row.updatedBy.name } : null,
    latestResultSummary: row.resultSummary ? parseJson<DesignResultSummary>(row.resultSummary) : null,
  };
}

/** Issues from the engine as 400 details, optionally under a body key ("inputs.belt.pitchMm"). */
function engineIssues(issues: { path: string; message: string }[], prefix = ''): ErrorDetail[] {
  return issues.map((i) => ({ path: [prefix, i.path].filter(Boolean).join('.') || 'body', message: i.message }));
}

/**
 * Runs the engine on a validated document and keeps what the list and cards need: travel and a summary.
 * Called on every save, so the stored travel always matches the stored inputs.
 */
export function computeStoredResults(
  document: DesignInput,
  pathPrefix = '',
): { travelXMm: number; travelYMm: number; resultSummary: DesignResultSummary } {
  let result: DesignResult;
  try {
    result = evaluateValidDesign(document);
  } catch (err) {
    if (err instanceof EngineInputError) throw validationError(engineIssues(err.issues, pathPrefix), 'The design is not valid.');
    throw err;
  }
  const bySeverity: Record<string, number> = {};
  for (const check of result.checks) bySeverity[check.severity] = (bySeverity[check.severity] ?? 0) + 1;
  const worst = result.envelope.axes.worst;
  return {
    travelXMm: result.travel.xMm,
    travelYMm: result.travel.yMm,
    resultSummary: {
      engineVersion: result.engineVersion,
      stepsPerMm: result.drive.stepsPerMm,
      microstep: { ...result.drive.microstep },
      worst: {
        directionDeg: worst.directionDeg,
        accelMaxMPerS2: worst.accelMaxMPerS2,
        accelAtCruiseMPerS2: worst.accelAtCruiseMPerS2,
        // Top speed, worst direction: the lowest over all directions, not the speed along directionDeg (docs/models/envelope.md §3).
        speedMaxMPerS: slowestDirection(result.envelope).speedMaxMPerS,
      },
      lowestFrequencyHz: result.stiffness.min.frequencyHz,
      checks: { total: result.checks.length, bySeverity },
    },
  };
}

/** Validates stored or copied inputs again (the schema may have gained defaults since they were saved). */
function normalise(document: unknown, pathPrefix = ''): DesignInput {
  const parsed = safeParseDesign(document);
  if (!parsed.ok) throw validationError(engineIssues(parsed.issues, pathPrefix), 'The design is not valid.');
  return parsed.value;
}

function withName(document: DesignInput, name: string | undefined): DesignInput {
  return name === undefined ? document : { ...document, name };
}

/** Escapes % and _ so a search term matches literally inside LIKE. */
function escapeLike(term: string): string {
  return term.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** InnoDB's default full-text stop words: the index leaves them out, so they are matched with LIKE instead. */
const FULLTEXT_STOPWORDS = new Set(
  'a about an are as at be by com de en for from how i in is it la of on or that the this to was what when where who will with und www'.split(
    ' ',
  ),
);
/** InnoDB indexes words of at least this many characters (innodb_ft_min_token_size). */
const FULLTEXT_MIN_WORD = 3;

/**
 * The name search of the Designs list, built so that no keystroke scans every row: each typed word of three or
 * more letters must begin a word of the name (FULLTEXT index, boolean mode with prefixes), and among the rows
 * the index finds, the name must contain what was typed as it is (LIKE, wildcards literal). Typing only short
 * words or stop words ("xy") matches names that begin with the text (a range of the name index).
 * @param q - what was typed
 * @returns the conditions, ANDed with the other filters
 */
export function nameSearch(q: string): WhereOptions[] {
  const text = q.trim();
  const words = text
    .toLowerCase()
    .split(/[^\p{L}\p{N}_]+/u)
    .filter(Boolean);
  const indexed = words.filter((w) => w.length >= FULLTEXT_MIN_WORD && !FULLTEXT_STOPWORDS.has(w)).slice(0, 10);
  if (!indexed.length) return [{ name: { [Op.like]: `${escapeLike(text)}%` } }];
  const against = indexed.map((w) => `+${w}*`).join(' ');
  const match = literal(
    `MATCH (\`Design\`.\`name\`) AGAINST (${getSequelize().escape(against)} IN BOOLEAN MODE)`,
  ) as unknown as WhereOptions;
  // One indexed word typed as it is ("dispens"): the index match already means the name contains it.
  if (words.length === 1 && indexed.length === 1 && text.toLowerCase() === indexed[0]) return [match];
  return [match, { name: { [Op.like]: `%${escapeLike(text)}%` } }];
}

const OWNER_INCLUDE = { model: User, as: 'owner', attributes: ['id', 'name'] };
const UPDATED_BY_INCLUDE = { model: User, as: 'updatedBy', attributes: ['id', 'name'] };

function sortOrder(sort: string): Order {
  const descending = sort.startsWith('-');
  const key = descending ? sort.slice(1) : sort;
  const dir = descending ? 'DESC' : 'ASC';
  // The owner's name is kept on the design (owner_name, indexed), so this sort needs no join.
  const primary: Order = key === 'owner' ? [['ownerName', dir]] : [[key, dir]];
  // A stable tie-breaker keeps pages from overlapping when many rows share a value.
  return [...(primary as unknown[]), ['id', dir]] as Order;
}

/**
 * Lists designs for the Designs table: every team member sees every design (reviewers and makers read only).
 * Filters by name search, status, mechanism and owner ("me" or an id); sorts by one column.
 */
export async function listDesigns(actor: PublicUser, query: DesignListRequest): Promise<Page<DesignListItem>> {
  const where: Record<string | symbol, unknown> = {};
  if (query.q?.trim()) where[Op.and] = nameSearch(query.q);
  if (query.status?.length) where.status = { [Op.in]: query.status };
  if (query.mechanism?.length) where.mechanism = { [Op.in]: query.mechanism };
  if (query.owner !== undefined) where.ownerId = query.owner === 'me' ? actor.id : query.owner;
  // The page's ids first: a walk along the sort key's index that reads nothing but the index, however deep the
  // page; then those rows with their owners. The count runs on the designs table alone (no join, smallest index)
  // instead of findAndCountAll's count over the join.
  const order = sortOrder(query.sort);
  const [ids, count] = await Promise.all([
    Design.findAll({
      where: where as WhereOptions,
      attributes: ['id'],
      order,
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
      raw: true,
    }),
    Design.count({ where: where as WhereOptions }),
  ]);
  const rows = ids.length
    ? await Design.findAll({
        where: { id: { [Op.in]: ids.map((r) => r.id) } },
        attributes: { exclude: ['inputs', 'resultSummary'] },
        include: [OWNER_INCLUDE],
        order,
      })
    : [];
  const authored = await inReviewAuthoredBy(actor, rows);
  return {
    items: rows.map((row) => toListItem(row, actor, mayReadDesign(actor, row, authored.has(row.id) ? { authorId: actor.id } : null))),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/**
 * Of the listed designs whose read rule needs the author of the revision in review (access.ts,
 * designReadNeedsAuthor), the ids of those whose revision in review `actor` wrote: one query per page, only when needed.
 */
async function inReviewAuthoredBy(actor: PublicUser, rows: readonly DesignRow[]): Promise<Set<number>> {
  const ids = rows.filter((row) => designReadNeedsAuthor(actor, row)).map((row) => row.id);
  if (!ids.length) return new Set();
  const revisions = await Revision.findAll({
    where: { designId: { [Op.in]: ids }, status: 'in_review', authorId: actor.id },
    attributes: ['designId'],
    raw: true,
  });
  return new Set(revisions.map((r) => r.designId));
}

async function findDesign(id: number, transaction?: Transaction): Promise<DesignRow> {
  const row = await Design.findByPk(id, { include: [OWNER_INCLUDE, UPDATED_BY_INCLUDE], transaction });
  if (!row) throw notFound('Design');
  return row;
}

/**
 * 403 unless `actor` may read the design's inputs (access.ts, mayReadDesign): the author of the revision in review
 * is looked up only when the rule needs it.
 */
async function assertMayRead(actor: PublicUser, design: Pick<Design, 'id' | 'ownerId' | 'status'>): Promise<void> {
  const inReview = designReadNeedsAuthor(actor, design)
    ? await Revision.findOne({ where: { designId: design.id, status: 'in_review' }, attributes: ['authorId'] })
    : null;
  assertMayReadDesign(actor, design, inReview);
}

/** One design with its inputs: every team member, but a design in review only for those who may read its revision. */
export async function getDesign(actor: PublicUser, id: number): Promise<DesignDetail> {
  const row = await findDesign(id);
  await assertMayRead(actor, row);
  return toDetail(row, actor);
}

/**
 * Creates a draft owned by `actor` from a document (also import), a mechanism template or a copy of another
 * design (any design the user can read, in any state). Travel and the result summary are computed now.
 */
export async function createDesign(actor: PublicUser, input: CreateDesignRequest): Promise<DesignDetail> {
  let document: DesignInput;
  let origin: string;
  if (input.mode === 'template') {
    document = withName(defaultDesign(input.template), input.name);
    origin = `template ${input.template}`;
  } else if (input.mode === 'copy') {
    const source = await Design.findByPk(input.copyOf);
    if (!source)
      throw new AppError('not_found', 'The design to copy was not found.', 404, {
        details: [{ path: 'copyOf', message: 'no design with this id' }],
      });
    await assertMayRead(actor, source);
    const name = input.name ?? `Copy of ${source.name}`.slice(0, 200);
    document = normalise({ ...parseJson<DesignInput>(source.inputs), name });
    origin = `copy of design ${source.id}`;
  } else {
    document = input.document;
    origin = 'document';
  }
  const stored = await storedResultsInPool(document);

  const row = await getSequelize().transaction(async (transaction) => {
    const created = await Design.create(
      {
        name: document.name,
        mechanism: document.mechanism,
        status: 'draft',
        ownerId: actor.id,
        updatedById: actor.id,
        inputs: document as unknown as Record<string, unknown>,
        ...stored,
        version: 1,
      },
      { transaction },
    );
    await recordAudit(
      { actorId: actor.id, action: 'design.create', entity: 'design', entityId: created.id, toState: 'draft', reason: origin },
      transaction,
    );
    return created;
  });
  return getDesign(actor, row.id);
}

/** 409 `version_conflict`: someone saved since the client read `version`; details say who and when. */
function versionConflict(row: DesignRow): AppError {
  const details: VersionConflictDetails = {
    currentVersion: row.version,
    updatedBy: row.updatedBy ? { id: row.updatedBy.id, name: row.updatedBy.name } : null,
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
  // The error body's `details` is usually a list of field issues; for a version conflict it is this object
  // (the contract of PATCH /api/designs/:id).
  return new AppError(
    'version_conflict',
    `This design was changed by ${details.updatedBy?.name ?? 'someone else'} since you opened it (now version ${row.version}). Reload it, or save your inputs as a copy.`,
    409,
    {
      details,
    },
  );
}

function notEditable(row: Design): AppError {
  const label = row.status === 'in_review' ? 'in review' : row.status;
  return conflict(`This design is ${label}; only drafts and returned designs can be changed.`, 'not_editable');
}

/**
 * Saves new inputs and/or a new name with the optimistic lock: the UPDATE only matches when the stored
 * version still equals the one the client read and the design is still editable, so two saves can never
 * both win. @returns the design with its new version.
 */
export async function updateDesign(actor: PublicUser, id: number, patch: UpdateDesignRequest): Promise<DesignDetail> {
  const row = await findDesign(id);
  assertMayChangeDesign(actor, row, 'change');
  if (!EDITABLE_DESIGN_STATUSES.includes(row.status as DesignStatus)) throw notEditable(row);
  if (row.version !== patch.version) throw versionConflict(row);

  const document = withName(patch.inputs ?? normalise(parseJson(row.inputs), 'inputs'), patch.name);
  const stored = patch.inputs ? await storedResultsInPool(document, 'inputs') : {};

  // The answer is read in the same transaction as the save, so it shows exactly the version this save wrote (a save
  // by someone else a moment later must not be reported as this one's: the client would then overwrite it unseen).
  const saved = await getSequelize().transaction(async (transaction) => {
    const [affected] = await Design.update(
      {
        name: document.name,
        mechanism: document.mechanism,
        inputs: document as unknown as Record<string, unknown>,
        ...stored,
        updatedById: actor.id,
        version: patch.version + 1,
      },
      {
        where: { id, version: patch.version, status: { [Op.in]: [...EDITABLE_DESIGN_STATUSES] } },
        transaction,
      },
    );
    return affected === 0 ? null : findDesign(id, transaction);
  });
  if (!saved) {
    const now = await findDesign(id);
    if (!EDITABLE_DESIGN_STATUSES.includes(now.status as DesignStatus)) throw notEditable(now);
    throw versionConflict(now);
  }
  return toDetail(saved, actor);
}

/**
 * The checks every change of a design's inputs passes before anything is read or written: it exists (404), the
 * actor may change it (403), it is still a draft or returned (409 `not_editable`) and the client's version is
 * current (409 `version_conflict`). Used by uploads that change the inputs (the job file).
 * @param version - the version the client holds; omit to skip the version check (before the upload is read)
 * @returns the design's current inputs
 */
export async function assertInputsChangeable(actor: PublicUser, id: number, version?: number): Promise<DesignInput> {
  const row = await findDesign(id);
  assertMayChangeDesign(actor, row, 'change');
  if (!EDITABLE_DESIGN_STATUSES.includes(row.status as DesignStatus)) throw notEditable(row);
  if (version !== undefined && row.version !== version) throw versionConflict(row);
  return normalise(parseJson(row.inputs), 'inputs');
}

/**
 * Writes new inputs under the optimistic lock inside a caller's transaction (so an upload can store its file and
 * audit row together with the change): 409 when the version moved on or the design left draft meanwhile.
 * @param document - the validated new inputs
 * @param stored - its stored results, computed before the transaction (`storedResultsInPool`)
 * @param version - the version the change is based on
 */
export async function writeInputsLocked(
  actor: PublicUser,
  id: number,
  version: number,
  document: DesignInput,
  stored: Awaited<ReturnType<typeof storedResultsInPool>>,
  transaction: Transaction,
): Promise<void> {
  const [affected] = await Design.update(
    {
      name: document.name,
      mechanism: document.mechanism,
      inputs: document as unknown as Record<string, unknown>,
      ...stored,
      updatedById: actor.id,
      version: version + 1,
    },
    { where: { id, version, status: { [Op.in]: [...EDITABLE_DESIGN_STATUSES] } }, transaction },
  );
  if (affected === 0) {
    const now = await findDesign(id);
    if (!EDITABLE_DESIGN_STATUSES.includes(now.status as DesignStatus)) throw notEditable(now);
    throw versionConflict(now);
  }
}

/**
 * Validates a document built by the server (e.g. stored inputs with uploaded job points) and answers 400 naming
 * each bad field, prefixed as the client would send it.
 */
export function validDocument(document: unknown, pathPrefix = 'inputs'): DesignInput {
  return normalise(document, pathPrefix);
}

/** Deletes a draft (or returned) design: designers their own, admins any. 409 once it is in review or approved. */
export async function deleteDesign(actor: PublicUser, id: number): Promise<void> {
  const row = await findDesign(id);
  assertMayChangeDesign(actor, row, 'delete');
  if (!DELETABLE_DESIGN_STATUSES.includes(row.status as DesignStatus)) {
    throw conflict(`This design is ${row.status === 'in_review' ? 'in review' : row.status}; only drafts can be deleted.`, 'not_deletable');
  }
  const attachmentHashes = await getSequelize().transaction(async (transaction) => {
    // The attachment rows go with the design (ON DELETE CASCADE); note their hashes to clean up the bytes after.
    const attachments = await Attachment.findAll({
      where: { designId: id },
      attributes: ['id', 'sha256'],
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const deleted = await Design.destroy({ where: { id, status: { [Op.in]: [...DELETABLE_DESIGN_STATUSES] } }, transaction });
    if (deleted === 0) throw conflict('This design changed state while deleting; reload it.', 'not_deletable');
    await recordAudit({ actorId: actor.id, action: 'design.delete', entity: 'design', entityId: id, fromState: row.status }, transaction);
    return attachments.map((a) => a.sha256);
  });
  // Only after the commit: bytes still referenced by another attachment or a recording stay.
  await removeUnreferencedBytes(attachmentHashes);
}

/** A file name for a design's export: the name in lower-case kebab form, `.json`. */
export function exportFileName(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 80);
  return `${slug || 'design'}.json`;
}

/** The design document (src/engine/README.md) of a design, for download; POST /api/designs imports it again. Same rule as reading it. */
export async function exportDesign(actor: PublicUser, id: number): Promise<{ fileName: string; document: DesignInput }> {
  const row = await Design.findByPk(id, { attributes: ['id', 'name', 'inputs', 'ownerId', 'status'] });
  if (!row) throw notFound('Design');
  await assertMayRead(actor, row);
  return { fileName: exportFileName(row.name), document: parseJson<DesignInput>(row.inputs) };
}
