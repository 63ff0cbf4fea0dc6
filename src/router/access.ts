import type { Role } from '@/api/types';

/**
 * Who may open which screen. The server enforces the same rules on every API route; these lists only
 * decide what the UI offers, so a person is not shown screens that would refuse them.
 */

/** Designs and the Design desk. */
export const DESIGN_ROLES: readonly Role[] = ['designer', 'reviewer', 'admin'];
/** Review desk and review pages. */
export const REVIEW_ROLES: readonly Role[] = ['reviewer', 'admin'];
/** Approved design sheets. */
export const SHEET_ROLES: readonly Role[] = ['maker', 'designer', 'reviewer', 'admin'];
/** Team and Outbox. */
export const ADMIN_ROLES: readonly Role[] = ['admin'];
/** The Parts shelf: every team member. An account without any role sees only its own account page. */
export const MEMBER_ROLES: readonly Role[] = ['designer', 'reviewer', 'maker', 'admin'];

/**
 * Whether someone holding `roles` may open a screen limited to `allowed`.
 * @param allowed - roles that grant access; undefined or empty means any signed-in user
 * @param roles - roles the user holds
 */
export function canAccess(allowed: readonly Role[] | undefined, roles: readonly Role[]): boolean {
  if (!allowed || allowed.length === 0) return true;
  return allowed.some((r) => roles.includes(r));
}

/**
 * The first screen to show after signing in: the Review desk for reviewers (their work waits there), Designs for
 * the others who may see designs, otherwise Sheets, otherwise the Parts shelf; an account without a role gets its
 * account page (the server shows it nothing else).
 * @param roles - roles the user holds
 * @returns a path
 */
export function homePathFor(roles: readonly Role[]): string {
  if (roles.includes('reviewer')) return '/review';
  if (canAccess(DESIGN_ROLES, roles)) return '/designs';
  if (canAccess(SHEET_ROLES, roles)) return '/sheets';
  if (canAccess(MEMBER_ROLES, roles)) return '/parts';
  return '/account';
}

/**
 * Accepts a `?next=` target only if it is a path inside this app, so the sign-in page cannot be used
 * to send people to another site.
 * @param next - the raw query value
 * @returns the path, or null when unusable
 */
export function safeNextPath(next: unknown): string | null {
  if (typeof next !== 'string') return null;
  if (!next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
  if (next.startsWith('/sign-in')) return null;
  return next;
}
