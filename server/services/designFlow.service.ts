import type { Transaction } from 'sequelize';
import type { DesignStatus, RevisionDetail } from '@/contracts';
import type { UnitSystem } from '@/format';
import { getSequelize } from '../db';
import { AppError, conflict, notFound } from '../errors';
import { Design, Revision } from '../models';
import { freezeInPool } from '../workers/pool';
import { assertMayChangeDesign } from './access';
import { recordAudit } from './audit.service';
import { deliverSoon, queueMail, submittedMail } from './notify.service';
import { getRevision } from './revisions.service';
import { findActiveUsersByRole, type PublicUser } from './users.service';

/**
 * The design's review workflow started by its designer: submit (freeze a new revision and move the design to In
 * review), withdraw, reopen. Every transition locks the design row without waiting, checks the state, logs to the
 * audit log and mails after the commit. The reviewer's decisions are in reviews.service.ts; who may do what, in
 * access.ts.
 */

/** Labels of states in messages. */
const STATE_WORDS: Record<string, string> = {
  draft: 'a draft',
  in_review: 'in review',
  approved: 'approved',
  returned: 'returned',
  withdrawn: 'withdrawn',
};
export const stateWord = (status: string): string => STATE_WORDS[status] ?? status;

/** MariaDB's answer to `FOR UPDATE NOWAIT` when another transaction holds the row. */
const ER_LOCK_WAIT_TIMEOUT = 1205;

/**
 * Locks a design row for a transition, without waiting: when another request holds it (a concurrent submit,
 * approval, withdrawal …) this one is refused at once with 409 `busy` instead of queueing behind it while holding a
 * pooled connection (issue 12, item 2: 12 concurrent submits of one draft stalled the whole app for 20 s).
 * @throws 404 when the design does not exist, 409 `busy` when it is locked
 */
export async function lockDesign(id: number, transaction: Transaction): Promise<Design> {
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
    assertMayChangeDesign(actor, design, 'submit');
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
    assertMayChangeDesign(actor, design, 'withdraw');
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
    assertMayChangeDesign(actor, design, 'reopen');
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
