import type { Role } from '@/contracts';

/** Display name of each role. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  designer: 'Designer',
  reviewer: 'Reviewer',
  maker: 'Maker',
};

/** One line on what each role may do (shown where roles are chosen). */
export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  designer: 'Creates and edits designs, runs calculations, submits revisions for review.',
  reviewer: 'Checks submitted revisions, comments, approves or returns them.',
  maker: 'Downloads approved design sheets and records belt tension measurements.',
  admin: 'Manages the team and the parts shelf; may do everything the other roles do.',
};

/**
 * Every role of the contract, in the order the screens list them: the order of ROLE_DESCRIPTIONS (a record over the
 * contract's roles, so none is missing and none is added here).
 */
export const ROLES_ON_SCREEN = Object.keys(ROLE_DESCRIPTIONS) as Role[];

/**
 * Sorts roles into the order the UI shows them (designer, reviewer, maker, admin).
 * @param roles - roles in any order
 * @returns a new sorted array
 */
export function sortRoles(roles: readonly Role[]): Role[] {
  return [...roles].sort((a, b) => ROLES_ON_SCREEN.indexOf(a) - ROLES_ON_SCREEN.indexOf(b));
}
