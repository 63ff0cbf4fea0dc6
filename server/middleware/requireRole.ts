import type { RequestHandler } from 'express';
import { forbidden } from '../errors';
import type { Role } from '../models';
import { authenticate } from './requireAuth';

/**
 * Allows the request when the signed-in user holds at least one of `roles`. Admins pass every role
 * check ("admin: everything above"); rules such as "cannot approve own work" belong in the services.
 * Authenticates first when requireAuth has not run, so `requireRole(...)` alone is enough on a route:
 * 401 without a session, 403 without the role.
 */
export function requireRole(...roles: Role[]): RequestHandler & { roles: readonly Role[] } {
  const allowed = new Set<Role>(roles);
  const requireRoleMiddleware: RequestHandler = async function requireRoleMiddleware(req, _res, next) {
    const user = await authenticate(req);
    if (!user.roles.includes('admin') && !user.roles.some((r) => allowed.has(r))) throw forbidden();
    next();
  };
  // Readable on the middleware, so tests walking the real router know each route's rule.
  return Object.assign(requireRoleMiddleware, { roles });
}

/** Every role a member of the team can hold besides admin (who passes every check anyway). */
const MEMBER_ROLES: readonly Role[] = ['designer', 'reviewer', 'maker'];

/**
 * Requires a signed-in user who holds at least one role: a team member. An account without a role (invited, not yet
 * given one) sees nothing but its own profile and sessions (issue 12, item 8), so every route that reads or computes
 * team data uses this (or a narrower requireRole), never requireAuth alone.
 */
export const requireMember = requireRole(...MEMBER_ROLES);
