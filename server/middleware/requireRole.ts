import type { RequestHandler } from 'express';
import { forbidden } from '../errors';
import type { Role } from '../models';
import { holdsAnyRole } from '../services/access';
import { authenticate } from './requireAuth';
import { asRouteMiddleware, type RouteMiddleware } from './validate';

/**
 * Allows the request when the signed-in user holds at least one of `roles`. Admins pass every role
 * check ("admin: everything above"; services/access.ts holdsAnyRole); rules that depend on the rows, such as
 * "cannot approve own work", are the other rules of services/access.ts, asked by the services.
 * Authenticates first when requireAuth has not run, so `requireRole(...)` alone is enough on a route:
 * 401 without a session, 403 without the role.
 */
export function requireRole(...roles: Role[]): RouteMiddleware & { roles: readonly Role[] } {
  const requireRoleMiddleware: RequestHandler = async function requireRoleMiddleware(req, _res, next) {
    const user = await authenticate(req);
    if (!holdsAnyRole(user, roles)) throw forbidden();
    next();
  };
  // Readable on the middleware, so tests walking the real router know each route's rule.
  return Object.assign(asRouteMiddleware(requireRoleMiddleware), { roles });
}

/** Every role a member of the team can hold besides admin (who passes every check anyway). */
const MEMBER_ROLES: readonly Role[] = ['designer', 'reviewer', 'maker'];

/**
 * Requires a signed-in user who holds at least one role: a team member. An account without a role (invited, not yet
 * given one) sees nothing but its own profile and sessions (issue 12, item 8), so every route that reads or computes
 * team data uses this (or a narrower requireRole), never requireAuth alone.
 */
export const requireMember = requireRole(...MEMBER_ROLES);
