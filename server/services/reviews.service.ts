import type { CommentItem, Page, RevisionDetail, SheetDetail } from '@/contracts';
import type { Transaction } from 'sequelize';
import type { DesignInput, DesignResult } from '@/engine';
import { isUnitSystem, plural } from '@/format';
import { getSequelize } from '../db';
import { conflict, notFound, validationError } from '../errors';
import { Design, Revision, RevisionComment, User } from '../models';
import { storeWithRowsMaking } from './fileStore.service';
import { recordAudit } from './audit.service';
import { approvedMail, deliverSoon, queueMail, returnedMail, sheetPublishedMail, type Recipient } from './notify.service';
import { assertMayComment, assertMayDecide, assertMayReadRevision } from './access';
import { lockDesign, stateWord } from './designFlow.service';
import { findRevision, getRevision } from './revisions.service';
import { parseJson } from './storedJson';
import { getSheet, renderSheetFilesOffThread, storeSheet } from './sheets.service';
import { findActiveUsersByRole, type PublicUser } from './users.service';

/**
 * The reviewer's side of a revision: the threaded discussion, approval (which publishes the design sheet) and
 * return with a reason. Every transition is checked against the revision's state inside a transaction that
 * locks the design row, logged in the audit log, and announced by mail after the commit.
 */

type CommentRow = RevisionComment & { author?: User | null };

function toComment(row: CommentRow): CommentItem {
  return {
    id: row.id,
    revisionId: row.revisionId,
    parentId: row.parentId,
    author: { id: row.authorId, name: row.author?.name ?? '', roles: (row.author?.roles as string[] | undefined) ?? [] },
    body: row.body,
    createdAt: new Date(row.createdAt).toISOString(),
  };
}

/** The discussion of a revision, oldest first (the client nests replies under `parentId`). */
export async function listComments(actor: PublicUser, revisionId: number): Promise<Page<CommentItem>> {
  const revision = await findRevision(revisionId);
  assertMayReadRevision(actor, revision, revision.design);
  const rows = (await RevisionComment.findAll({
    where: { revisionId },
    include: [{ model: User, as: 'author', attributes: ['id', 'name', 'roles'] }],
    order: [
      ['createdAt', 'ASC'],
      ['id', 'ASC'],
    ],
  })) as CommentRow[];
  return { items: rows.map(toComment), total: rows.length, page: 1, pageSize: Math.max(rows.length, 1) };
}

/**
 * Adds a comment (or a reply, with `parentId` of a comment on the same revision). Reviewers, admins, the design's
 * owner and the revision's author, in any state of the revision: the discussion may go on after a decision.
 * @throws 403 for others, 400 when `parentId` is not a comment of this revision
 */
export async function addComment(
  actor: PublicUser,
  revisionId: number,
  input: { body: string; parentId?: number | null },
): Promise<CommentItem> {
  const revision = await findRevision(revisionId);
  assertMayComment(actor, revision, revision.design);
  const parentId = input.parentId ?? null;
  if (parentId !== null) {
    const parent = await RevisionComment.findByPk(parentId, { attributes: ['id', 'revisionId'] });
    if (!parent || parent.revisionId !== revisionId)
      throw validationError([{ path: 'parentId', message: 'is not a comment on this revision' }]);
  }
  const row = await RevisionComment.create({ revisionId, parentId, authorId: actor.id, body: input.body });
  const created = (await RevisionComment.findByPk(row.id, {
    include: [{ model: User, as: 'author', attributes: ['id', 'name', 'roles'] }],
  })) as CommentRow;
  return toComment(created);
}

function wrongState(number: number, status: string, verb: 'approved' | 'returned'): Error {
  return conflict(`Revision ${number} is ${stateWord(status)}; only a revision in review can be ${verb}.`, 'invalid_state');
}

/** Locks the design and re-reads the revision in the transaction; the state must still be in review. */
async function lockForDecision(
  revisionId: number,
  designId: number,
  verb: 'approved' | 'returned',
  transaction: Parameters<typeof lockDesign>[1],
) {
  const design = await lockDesign(designId, transaction);
  const revision = await Revision.findByPk(revisionId, { attributes: { exclude: ['result'] }, transaction, lock: transaction.LOCK.UPDATE });
  if (!revision) throw notFound('Revision');
  if (revision.status !== 'in_review') throw wrongState(revision.number, revision.status, verb);
  if (design.status !== 'in_review') throw conflict(`The design is ${stateWord(design.status)}, not in review.`, 'invalid_state');
  return { design, revision };
}

/** The designer(s) to tell about a decision: the design's owner and the revision's author (read in `transaction`). */
async function designersOf(revision: { authorId: number }, ownerId: number, transaction: Transaction): Promise<Recipient[]> {
  const users = await User.findAll({
    where: { id: [...new Set([ownerId, revision.authorId])], disabled: false },
    attributes: ['email', 'name'],
    transaction,
  });
  return users.map((u) => ({ email: u.email, name: u.name }));
}

/**
 * Approves a revision in review: in one transaction renders the design sheet (A4 and US Letter) from the frozen
 * revision, marks the revision and design approved and stores the sheet (its row; the PDFs go to the content store
 * before the commit, see storeWithRowsMaking); logs it and mails the designer and every maker. Reviewers and
 * admins, never on their own work.
 * The design row is locked first, without waiting, and held while the sheet renders (in the PDF worker pool, so the
 * event loop keeps serving): of concurrent approvals one renders and wins, the others get 409 `busy` at once
 * (before, each rendered a sheet of its own and queued for the lock while holding a pooled connection). Every query
 * runs in that transaction (issue 12, item 2). On a database cluster a write conflict runs it all again; the retry
 * then finds the revision decided and answers 409.
 * A revision with a failed check is approved only with a written `justification` (checked under the lock, where the
 * frozen result is read); it goes into the audit log, the designer's mail and onto the sheet.
 * @throws 403 (role, own work), 400 (failed checks without a justification), 409 (not in review, or being decided
 * right now)
 */
export async function approveRevision(
  actor: PublicUser,
  revisionId: number,
  input: { comment: string; justification?: string },
): Promise<{ revision: RevisionDetail; sheet: SheetDetail }> {
  // Who and what state only (no inputs or result): most concurrent approvals end at the lock below, cheaply.
  const revision = await Revision.findByPk(revisionId, {
    attributes: ['id', 'designId', 'number', 'status', 'authorId'],
    include: [{ model: Design, as: 'design', attributes: ['id', 'ownerId'] }],
  });
  if (!revision) throw notFound('Revision');
  assertMayDecide(actor, revision, (revision as Revision & { design: Design }).design, 'approve');
  if (revision.status !== 'in_review') throw wrongState(revision.number, revision.status, 'approved');

  const approvedAt = new Date();

  // The sheet's rows and its PDF bytes (content store) are saved together: if the transaction fails, the bytes go again.
  const { sheetId, mailIds } = await storeWithRowsMaking(async (transaction) => {
    const { design, revision: locked } = await lockForDecision(revisionId, revision.designId, 'approved', transaction);
    // Only the request holding the lock reads the frozen inputs and result (~100 kB) and renders: the others are gone.
    const inputs = parseJson<DesignInput>(locked.inputs);
    const frozen = await Revision.findByPk(revisionId, { attributes: ['result'], transaction });
    const result = parseJson<DesignResult>(frozen!.result);
    // A failed check may be overruled only with a written reason; it goes into the audit log, the mail and the sheet.
    const failed = result.checks.filter((c) => c.severity === 'fail');
    const justification = failed.length ? (input.justification ?? '').trim() : '';
    if (failed.length && !justification) {
      throw validationError(
        [
          {
            path: 'justification',
            message: `is required: ${plural(failed.length, 'check')} of this revision failed; say why it may be built anyway`,
          },
        ],
        `Revision ${locked.number} has ${plural(failed.length, 'failed check')}: approving it needs a written justification.`,
      );
    }
    const author = await User.findByPk(locked.authorId, { attributes: ['name', 'email'], transaction });
    // In the PDF worker pool: the lock is held meanwhile, but the event loop keeps serving everyone else.
    const rendered = await renderSheetFilesOffThread({
      designName: inputs.name,
      revisionNumber: locked.number,
      mechanism: inputs.mechanism,
      designer: { name: author?.name ?? '', email: author?.email ?? '' },
      approval: { reviewerName: actor.name, approvedAt, comment: input.comment, justification: justification || null },
      inputs,
      result,
      fingerprint: locked.fingerprint,
      units: isUnitSystem(locked.sheetUnits) ? locked.sheetUnits : 'metric',
    });
    await locked.update(
      {
        status: 'approved',
        decidedById: actor.id,
        decidedAt: approvedAt,
        decisionNote: input.comment,
        approvalJustification: justification || null,
      },
      { transaction },
    );
    await design.update({ status: 'approved' }, { transaction });
    const id = await storeSheet(
      { revisionId, designId: design.id, approvedById: actor.id, approvedAt, comment: input.comment, rendered },
      transaction,
    );
    // An approval over failed checks names them and carries the reviewer's justification in the audit log.
    const overruled = failed.length
      ? `Approved with ${plural(failed.length, 'failed check')} (${failed.map((c) => c.subject ?? c.id).join(', ')}). Justification: ${justification}`
      : null;
    const note = [input.comment || null, overruled].filter(Boolean).join('\n') || null;
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.approve',
        entity: 'design',
        entityId: design.id,
        fromState: 'in_review',
        toState: 'approved',
        reason: note ?? `Approved revision ${locked.number}`,
      },
      transaction,
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'revision.approve',
        entity: 'revision',
        entityId: revisionId,
        fromState: 'in_review',
        toState: 'approved',
        reason: note,
      },
      transaction,
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'sheet.publish',
        entity: 'sheet',
        entityId: id,
        fromState: null,
        toState: 'published',
        reason: `A4 SHA-256 ${rendered.a4Sha256}; Letter SHA-256 ${rendered.letterSha256}`,
      },
      transaction,
    );

    const ref = { revisionId, number: locked.number, designId: design.id, designName: inputs.name };
    const designers = await designersOf(locked, design.ownerId, transaction);
    const makers = (await findActiveUsersByRole('maker', transaction)).filter((u) => u.id !== actor.id);
    const ids = [
      ...(await queueMail(
        'revision.approved',
        designers,
        (to) =>
          approvedMail(to, { ...ref, reviewerName: actor.name, comment: input.comment, sheetId: id, justification: justification || null }),
        transaction,
      )),
      ...(await queueMail(
        'sheet.published',
        makers,
        (to) => sheetPublishedMail(to, { ...ref, sheetId: id, sha256: rendered.a4Sha256 }),
        transaction,
      )),
    ];
    return { result: { sheetId: id, mailIds: ids }, bytes: [rendered.a4, rendered.letter] };
  });
  deliverSoon(mailIds);
  return { revision: await getRevision(actor, revisionId), sheet: await getSheet(actor, sheetId) };
}

/**
 * Returns a revision in review to its designer with a reason: the revision becomes `returned`, the design
 * `returned` (editable again, the reason shown), logged and mailed to the designer.
 * @throws 403 (role, own work), 409 (not in review)
 */
export async function returnRevision(actor: PublicUser, revisionId: number, input: { reason: string }): Promise<RevisionDetail> {
  const revision = await findRevision(revisionId);
  assertMayDecide(actor, revision, revision.design, 'return');
  if (revision.status !== 'in_review') throw wrongState(revision.number, revision.status, 'returned');

  const mailIds = await getSequelize().transaction(async (transaction) => {
    const { design, revision: locked } = await lockForDecision(revisionId, revision.designId, 'returned', transaction);
    await locked.update({ status: 'returned', decidedById: actor.id, decidedAt: new Date(), decisionNote: input.reason }, { transaction });
    await design.update({ status: 'returned' }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        action: 'design.return',
        entity: 'design',
        entityId: design.id,
        fromState: 'in_review',
        toState: 'returned',
        reason: input.reason,
      },
      transaction,
    );
    await recordAudit(
      {
        actorId: actor.id,
        action: 'revision.return',
        entity: 'revision',
        entityId: revisionId,
        fromState: 'in_review',
        toState: 'returned',
        reason: input.reason,
      },
      transaction,
    );
    const designName = parseJson<{ name: string }>(locked.inputs).name;
    const designers = await designersOf(locked, design.ownerId, transaction);
    return queueMail(
      'revision.returned',
      designers,
      (to) =>
        returnedMail(to, {
          revisionId,
          number: locked.number,
          designId: design.id,
          designName,
          reviewerName: actor.name,
          reason: input.reason,
        }),
      transaction,
    );
  });
  deliverSoon(mailIds);
  return getRevision(actor, revisionId);
}
