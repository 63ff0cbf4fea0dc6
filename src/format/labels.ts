import type { Mechanism, Severity } from '@/engine';
import type { ReadOnlyReason } from '@/contracts';

/** Mechanism names with what sets them apart, for pickers and headings. */
export const MECHANISM_LABELS: Record<Mechanism, string> = {
  corexy: 'CoreXY — crossed belts',
  hbot: 'H-bot — one H-shaped belt',
  cartesian: 'Cartesian — one motor per axis',
};

/** Short mechanism names for tables, tags and diffs. */
export const MECHANISM_SHORT: Record<Mechanism, string> = { corexy: 'CoreXY', hbot: 'H-bot', cartesian: 'Cartesian' };

/** A design's states, as people say them. */
export const DESIGN_STATUS_LABELS: Record<string, string> = {
  draft: 'Draft',
  in_review: 'In review',
  approved: 'Approved',
  returned: 'Returned',
  withdrawn: 'Withdrawn',
};

/** Check results as words (the shape and the word carry the result; colour only repeats it). */
export const SEVERITY_LABELS: Record<Severity, string> = { fail: 'Fail', warn: 'Warning', ok: 'OK' };

/**
 * A status code in words ("in_review" → "In review"); unknown codes are spelled out without underscores.
 * @param status - a design or revision status code
 */
export function statusLabel(status: string): string {
  return DESIGN_STATUS_LABELS[status] ?? status.replace(/_/g, ' ');
}

/**
 * A mechanism key in words ("hbot" → "H-bot"); unknown keys are returned as they are.
 * @param mechanism - a mechanism key
 */
export function mechanismLabel(mechanism: string): string {
  return MECHANISM_SHORT[mechanism as Mechanism] ?? mechanism;
}

/**
 * "1 warning", "3 failed checks" … a count with its noun.
 * @param count - how many
 * @param one - the noun for one
 * @param many - the noun for several (default: one + "s")
 */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count} ${count === 1 ? one : many}`;
}

/**
 * Why a design's inputs are read-only, in one sentence (the server says which reason: `DesignDetail.editable`).
 * @param reason - the server's reason code
 * @param ownerName - the design's owner, named when the design is someone else's
 */
export function readOnlyReasonText(reason: ReadOnlyReason, ownerName: string): string {
  switch (reason) {
    case 'in_review':
      return 'This design is in review: its inputs are frozen until a reviewer approves or returns it.';
    case 'approved_reopenable':
      return 'This design is approved: its inputs are frozen. Start a new revision to change it; the approved sheet stays in force until the new revision is approved.';
    case 'approved':
      return 'This design is approved: its inputs are frozen. Its owner or an admin can start a new revision.';
    case 'not_designer':
      return 'You can read this design; only designers and admins change designs.';
    case 'not_owner':
      return `This design belongs to ${ownerName || 'another designer'}; only the owner or an admin may change it.`;
  }
}
