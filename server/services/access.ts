import type { DesignEditable, DesignStatus, RevisionStatus, Role } from '@/contracts';
import { forbidden } from '../errors';

/**
 * Who may do what: every access rule of the API, as pure predicates over the signed-in user and the rows involved
 * (no database, no HTTP). Route middleware (requireRole) grants by role; these rules add what depends on the rows:
 * ownership, authorship and state. Services load the rows, ask here and answer 403 with the `assert…` helpers, whose
 * messages say who may.
 *
 * | What                                  | Who                                                                     |
 * |---------------------------------------|-------------------------------------------------------------------------|
 * | pass a role check                     | holders of one of the roles; admins pass every role check               |
 * | read a design                         | everyone, but one in review only reviewers, admins, owner, its author   |
 * | change, submit, withdraw, reopen one  | its owner as designer, or an admin                                      |
 * | edit / delete it (the buttons)        | as change, while it is a draft or returned                              |
 * | read a revision                       | reviewers, admins, the owner and the author; everyone once approved     |
 * | comment on a revision                 | reviewers, admins, the owner and the author, in any state               |
 * | approve or return a revision          | reviewers and admins, never on their own work                           |
 * | attach a file to a design             | its owner as designer, or an admin                                      |
 * | delete a design attachment            | an admin; a designer who attached it or owns the design                 |
 * | record a belt measurement             | makers and admins                                                       |
 */

/** The signed-in user as the rules see them. */
export type Actor = { id: number; roles: readonly Role[] };

/** Roles that read design sheets and their measurements (admins pass anyway). */
export const SHEET_READERS = ['maker', 'designer', 'reviewer'] as const satisfies readonly Role[];

/** States in which a design may be deleted: never once it is in review or approved. */
export const DELETABLE_DESIGN_STATUSES: readonly DesignStatus[] = ['draft', 'returned'];

export const isAdmin = (actor: Actor): boolean => actor.roles.includes('admin');

/** Reviewers and admins review. */
export const isReviewer = (actor: Actor): boolean => isAdmin(actor) || actor.roles.includes('reviewer');

/** A role check: `actor` holds one of `roles`, or is an admin ("admin: everything above"). */
export function holdsAnyRole(actor: Actor, roles: readonly Role[]): boolean {
  return isAdmin(actor) || actor.roles.some((role) => roles.includes(role));
}

// ---------------------------------------------------------------------------------------------------------
// Designs

/** `actor` is a designer and owns the design. */
export const isDesignerOwner = (actor: Actor, design: { ownerId: number }): boolean =>
  actor.roles.includes('designer') && design.ownerId === actor.id;

/** May change the design (inputs, name), submit, withdraw or reopen it, or attach files to it: its owner as designer, or an admin. */
export const mayChangeDesign = (actor: Actor, design: { ownerId: number }): boolean => isAdmin(actor) || isDesignerOwner(actor, design);

/**
 * May `actor` edit the design's inputs now, and if not, why (`editable` of a design detail; `canEdit` is its `ok`):
 * frozen in review; frozen once approved (a new revision is for those who may change it); a draft or a returned design
 * (EDITABLE_DESIGN_STATUSES) must be theirs to change — as a designer who owns it, or as an admin.
 */
export function designEditable(actor: Actor, design: { ownerId: number; status: DesignStatus }): DesignEditable {
  if (design.status === 'in_review') return { ok: false, reason: 'in_review' };
  if (design.status === 'approved') return { ok: false, reason: mayChangeDesign(actor, design) ? 'approved_reopenable' : 'approved' };
  if (mayChangeDesign(actor, design)) return { ok: true, reason: null };
  return { ok: false, reason: actor.roles.includes('designer') || isAdmin(actor) ? 'not_owner' : 'not_designer' };
}

/** May delete the design now: may change it and it is a draft or returned (`canDelete`). */
export const mayDeleteDesign = (actor: Actor, design: { ownerId: number; status: DesignStatus }): boolean =>
  mayChangeDesign(actor, design) && DELETABLE_DESIGN_STATUSES.includes(design.status);

/**
 * Whether `actor` may read a design's inputs. A design in review holds exactly the inputs of the revision under
 * review, so the revision read rule applies to it (issue 12, item 8): reviewers, admins, the owner and the revision's
 * author only, until it is approved. In every other state any team member reads it.
 * @param inReview - the design's revision in review (its author), or null; only consulted for a design in review
 */
export function mayReadDesign(
  actor: Actor,
  design: { ownerId: number; status: DesignStatus },
  inReview: { authorId: number } | null,
): boolean {
  if (design.status !== 'in_review') return true;
  return isReviewer(actor) || design.ownerId === actor.id || inReview?.authorId === actor.id;
}

/** True when reading the design needs its revision in review to decide (see {@link mayReadDesign}). */
export function designReadNeedsAuthor(actor: Actor, design: { ownerId: number; status: DesignStatus }): boolean {
  return design.status === 'in_review' && !isReviewer(actor) && design.ownerId !== actor.id;
}

/** 403 unless `actor` may read the design (see {@link mayReadDesign}). */
export function assertMayReadDesign(
  actor: Actor,
  design: { ownerId: number; status: DesignStatus },
  inReview: { authorId: number } | null,
): void {
  if (!mayReadDesign(actor, design, inReview)) {
    throw forbidden('This design is in review: only reviewers, admins and its designer can read it until it is approved.');
  }
}

/** 403 unless `actor` may change the design (see {@link mayChangeDesign}); `what` is the verb in the message. */
export function assertMayChangeDesign(actor: Actor, design: { ownerId: number }, what: string): void {
  if (!mayChangeDesign(actor, design)) throw forbidden(`Only the owner of this design or an admin can ${what} it.`);
}

// ---------------------------------------------------------------------------------------------------------
// Revisions

/** True when `actor` wrote the revision or owns its design ("own work"). */
export function isOwnWork(actor: Actor, revision: { authorId: number }, design: { ownerId: number }): boolean {
  return revision.authorId === actor.id || design.ownerId === actor.id;
}

/** Whether `actor` may read this revision: reviewers, admins, owner and author always; any team member once approved. */
export function mayReadRevision(
  actor: Actor,
  revision: { authorId: number; status: RevisionStatus },
  design: { ownerId: number },
): boolean {
  if (isReviewer(actor) || isOwnWork(actor, revision, design)) return true;
  return revision.status === 'approved' && actor.roles.length > 0;
}

/** 403 unless `actor` may read the revision. */
export function assertMayReadRevision(
  actor: Actor,
  revision: { authorId: number; status: RevisionStatus },
  design: { ownerId: number },
): void {
  if (!mayReadRevision(actor, revision, design)) {
    throw forbidden('Only reviewers, admins and the design’s owner can read a revision before it is approved.');
  }
}

/** Whether `actor` may take part in the discussion: reviewers, admins, the owner and the author. */
export function mayComment(actor: Actor, revision: { authorId: number }, design: { ownerId: number }): boolean {
  return isReviewer(actor) || isOwnWork(actor, revision, design);
}

/** 403 unless `actor` may comment on the revision. */
export function assertMayComment(actor: Actor, revision: { authorId: number }, design: { ownerId: number }): void {
  if (!mayComment(actor, revision, design)) throw forbidden('Only reviewers, admins and the design’s owner can comment on a revision.');
}

/** Whether `actor` may approve or return the revision, state aside: a reviewer or admin, not on their own work. */
export function mayDecide(actor: Actor, revision: { authorId: number }, design: { ownerId: number }): boolean {
  return isReviewer(actor) && !isOwnWork(actor, revision, design);
}

/** 403 unless `actor` may approve or return the revision (see {@link mayDecide}), saying which part of the rule failed. */
export function assertMayDecide(
  actor: Actor,
  revision: { authorId: number },
  design: { ownerId: number },
  verb: 'approve' | 'return',
): void {
  if (!isReviewer(actor)) throw forbidden(`Only reviewers and admins can ${verb} a revision.`);
  if (isOwnWork(actor, revision, design)) {
    throw forbidden(verb === 'approve' ? 'You cannot approve your own work.' : 'You cannot return your own work; withdraw it instead.');
  }
}

// ---------------------------------------------------------------------------------------------------------
// Attachments and measurements

/** 403 unless `actor` may attach files to the design (as {@link mayChangeDesign}). */
export function assertMayAttach(actor: Actor, design: { ownerId: number }): void {
  if (!mayChangeDesign(actor, design)) throw forbidden('Only the owner of this design or an admin can attach files to it.');
}

/**
 * Whether `actor` may delete an attachment: design attachments only (a torque table's source goes with the table),
 * by an admin, or a designer who attached it or owns the design.
 */
export function mayDeleteAttachment(
  actor: Actor,
  attachment: { uploadedById: number | null; designId: number | null | undefined },
  design: { ownerId: number } | null,
): boolean {
  if (attachment.designId === null || attachment.designId === undefined) return false;
  if (isAdmin(actor)) return true;
  if (!actor.roles.includes('designer')) return false;
  return attachment.uploadedById === actor.id || (design !== null && design.ownerId === actor.id);
}

/** 403 unless `actor` may delete the attachment (see {@link mayDeleteAttachment}). */
export function assertMayDeleteAttachment(
  actor: Actor,
  attachment: { uploadedById: number | null; designId: number | null | undefined },
  design: { ownerId: number } | null,
): void {
  if (!mayDeleteAttachment(actor, attachment, design))
    throw forbidden('Only whoever attached this file, the design owner or an admin can delete it.');
}

/** Makers (and admins) record belt measurements against a sheet. */
export const mayRecordMeasurement = (actor: Actor): boolean => actor.roles.includes('maker') || isAdmin(actor);
