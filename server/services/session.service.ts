import jwt from 'jsonwebtoken';
import type { CookieOptions } from 'express';
import { getConfig } from '../config';
import { User } from '../models';
import { toPublicUser, type PublicUser } from './users.service';

/** Name of the session cookie (httpOnly, SameSite=Lax). */
export const SESSION_COOKIE = 'gw_session';

/** Signs a session token for a user (HS256, expires after SESSION_HOURS). */
export function createSessionToken(userId: number): string {
  const { jwtSecret, sessionHours } = getConfig();
  return jwt.sign({}, jwtSecret, { algorithm: 'HS256', subject: String(userId), expiresIn: Math.round(sessionHours * 3600) });
}

/** Cookie options for setting (with Max-Age) or clearing the session cookie. */
export function sessionCookieOptions(forClearing = false): CookieOptions {
  const { sessionHours, appUrl } = getConfig();
  const base: CookieOptions = { httpOnly: true, sameSite: 'lax', path: '/', secure: appUrl.startsWith('https://') };
  return forClearing ? base : { ...base, maxAge: Math.round(sessionHours * 3600 * 1000) };
}

/**
 * Resolves a session token to the current user. The user row is read on every request, so a disabled
 * or deleted account loses access at once although the token itself is stateless.
 * @returns the user, or null when the token is missing, invalid, expired or the account is disabled.
 */
export async function readSessionUser(token: string | undefined): Promise<PublicUser | null> {
  if (!token) return null;
  let subject: string | undefined;
  try {
    const payload = jwt.verify(token, getConfig().jwtSecret, { algorithms: ['HS256'] });
    subject = typeof payload === 'object' ? payload.sub : undefined;
  } catch {
    return null;
  }
  const id = Number(subject);
  if (!Number.isSafeInteger(id) || id <= 0) return null;
  const user = await User.findByPk(id);
  if (!user || user.disabled) return null;
  return toPublicUser(user);
}
