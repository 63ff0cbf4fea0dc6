import type { Request, RequestHandler } from 'express';
import { unauthenticated } from '../errors';
import { readSession, SESSION_COOKIE } from '../services/session.service';
import type { PublicUser } from '../services/users.service';

/** The raw session token of a request (the session cookie), if any. */
export function sessionToken(req: Request): string | undefined {
  return (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
}

/**
 * Resolves the session cookie to an active user and an open session, and stores them on `req.user` and
 * `req.sessionId`.
 * @throws AppError 401 `unauthenticated` without a valid session (also after sign-out, a password change, or when the
 *   account was disabled).
 */
export async function authenticate(req: Request): Promise<PublicUser> {
  if (req.user) return req.user;
  const session = await readSession(sessionToken(req));
  if (!session) throw unauthenticated();
  req.user = session.user;
  req.sessionId = session.sessionId;
  return session.user;
}

/**
 * Requires a signed-in, active user (401 otherwise) and puts it on `req.user`. Any account passes, also one without
 * a role: use it only for the account's own profile and sessions; every other route uses requireRole / requireMember.
 */
export const requireAuth: RequestHandler = async function requireAuth(req, _res, next) {
  await authenticate(req);
  next();
};
