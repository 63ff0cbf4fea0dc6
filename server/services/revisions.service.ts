import { Op, type Transaction } from 'sequelize';
import type { DesignInput, DesignResult } from '@/engine';
import type { Page, RevisionDetail, RevisionDiff, RevisionListItem, RevisionStatus } from '@/contracts';
import { notFound } from '../errors';
import { Design, Revision, Sheet, User } from '../models';
import { assertMayReadRevision, mayChangeDesign, mayComment, mayDecide, mayReadRevision } from './access';
import { diffInputs, diffKeyResults } from './revisionDiff';
import { toRevisionListItem, type RevisionRow } from './revisionListItem';
import { parseJson } from './storedJson';
import type { PublicUser } from './users.service';

/**
 * Reading revisions: one with its frozen inputs and result, the review desk's list, a design's history and the
 * diff against the previous revision. Revisions are made by the workflow (designFlow.service.ts: submit, withdraw,
 * reopen) and decided in reviews.service.ts; they are never modified through the API. Who may read them is in
 * access.ts; the content of a new revision in freezeRevision.ts, its fingerprint in revisionFingerprint.ts, the diff
 * engine in revisionDiff.ts, the list shape in revisionListItem.ts.
 */

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
  const item = toRevisionListItem(row, actor);
  return {
    ...item,
    inputs: parseJson<DesignInput>(row.inputs),
    result: parseJson<DesignResult>(row.result),
    previousRevisionId: previous?.id ?? null,
    permissions: {
      canDecide: row.status === 'in_review' && mayDecide(actor, row, row.design),
      canComment: mayComment(actor, row, row.design),
      canWithdraw: row.status === 'in_review' && mayChangeDesign(actor, row.design),
    },
  };
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
  return {
    items: (rows as RevisionRow[]).map((row) => toRevisionListItem(row, actor)),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
  };
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
  const items = rows.filter((row) => mayReadRevision(actor, row, design)).map((row) => toRevisionListItem(row, actor));
  return { items, total: items.length, page: 1, pageSize: Math.max(items.length, 1) };
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
