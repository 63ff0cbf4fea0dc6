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
export function requireRole(...roles: Role[]): RequestHandler {
  const allowed = new Set<Role>(roles);
  return async function requireRoleMiddleware(req, _res, next) {
    const user = await authenticate(req);
    if (!user.roles.includes('admin') && !user.roles.some((r) => allowed.has(r))) throw forbidden();
    next();
  };
}
