import { ROLES, type Role } from '@/api/types';

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
 * Sorts roles into the order the UI shows them (designer, reviewer, maker, admin).
 * @param roles - roles in any order
 * @returns a new sorted array
 */
export function sortRoles(roles: readonly Role[]): Role[] {
  return [...roles].sort((a, b) => ROLES.indexOf(a) - ROLES.indexOf(b));
}
