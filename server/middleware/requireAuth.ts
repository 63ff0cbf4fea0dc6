import type { Request, RequestHandler } from 'express';
import { unauthenticated } from '../errors';
import { readSessionUser, SESSION_COOKIE } from '../services/session.service';
import type { PublicUser } from '../services/users.service';

/**
 * Resolves the session cookie to an active user and stores it on `req.user`.
 * @throws AppError 401 `unauthenticated` without a valid session (also for a disabled account whose cookie is still valid).
 */
export async function authenticate(req: Request): Promise<PublicUser> {
  if (req.user) return req.user;
  const token = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
  const user = await readSessionUser(token);
  if (!user) throw unauthenticated();
  req.user = user;
  return user;
}

/** Requires a signed-in, active user (401 otherwise) and puts it on `req.user`. */
export const requireAuth: RequestHandler = async function requireAuth(req, _res, next) {
  await authenticate(req);
  next();
};
