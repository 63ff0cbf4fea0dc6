import type { Page, SessionItem } from '@/contracts';
import { createHash, createSecretKey, randomBytes, type KeyObject } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { CookieOptions } from 'express';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { getConfig } from '../config';
import { getSequelize } from '../db';
import { notFound } from '../errors';
import { Session, type SessionRevokeReason } from '../models';
import { toPublicUser, type PublicUser } from './users.service';

/**
 * Sessions. Signing in creates a row in `sessions` and a cookie holding a signed token (HS256) with the user id,
 * a random session id and an expiry. A request is signed in only when the token verifies, carries an expiry, and
 * its session row is neither revoked nor expired and belongs to an active user — read in one query with the user.
 */

/** Name of the session cookie (httpOnly, SameSite=Strict). */
export const SESSION_COOKIE = 'gw_session';

/** `last_seen_at` is written at most this often per session, so reading a session stays one query. */
export const LAST_SEEN_RESOLUTION_MS = 5 * 60 * 1000;

/** Rows of sessions that ended longer ago than this are deleted now and then. */
const KEEP_ENDED_MS = 7 * 24 * 3600 * 1000;

let signingKey: { secret: string; key: KeyObject } | undefined;

/**
 * The HS256 key as a KeyObject, built once per secret: given a string, jsonwebtoken builds a new key object on
 * every call, which made verifying a token 33–43 times slower (issue 11).
 */
function sessionKey(): KeyObject {
  const secret = getConfig().jwtSecret;
  if (signingKey?.secret !== secret) signingKey = { secret, key: createSecretKey(Buffer.from(secret, 'utf8')) };
  return signingKey.key;
}

/** SHA-256 (hex) of a session id: what the table stores and looks up. */
export function hashSessionId(sessionId: string): string {
  return createHash('sha256').update(sessionId, 'utf8').digest('hex');
}

/** Where a sign-in came from, as the sessions list shows it. */
export type SessionOrigin = { userAgent?: string; ip?: string };

// Order matters: Edge and Opera also say "Chrome", Chrome also says "Safari", Android also says "Linux".
const BROWSERS: ReadonlyArray<readonly [RegExp, string]> = [
  [/Edg\//, 'Edge'],
  [/OPR\/|Opera/, 'Opera'],
  [/Firefox\//, 'Firefox'],
  [/Chrom(e|ium)\//, 'Chrome'],
  [/Safari\//, 'Safari'],
  [/^curl\//, 'curl'],
];
const SYSTEMS: ReadonlyArray<readonly [RegExp, string]> = [
  [/Android/, 'Android'],
  [/iPhone|iPad|iPod/, 'iOS'],
  [/CrOS/, 'ChromeOS'],
  [/Windows/, 'Windows'],
  [/Mac OS X|Macintosh/, 'macOS'],
  [/Linux/, 'Linux'],
];

/**
 * "Firefox on Linux", "Chrome on Android", "curl": enough to recognise one's own devices, without keeping the whole
 * User-Agent string.
 */
export function summariseUserAgent(userAgent: string | undefined): string {
  const ua = userAgent ?? '';
  if (!ua.trim()) return 'Unknown client';
  const browser = BROWSERS.find(([re]) => re.test(ua))?.[1] ?? null;
  const os = SYSTEMS.find(([re]) => re.test(ua))?.[1] ?? null;
  if (browser && os) return `${browser} on ${os}`;
  return (browser ?? os ?? ua.replace(/[^\x20-\x7e]/g, '').slice(0, 40)) || 'Unknown client';
}

/** "::ffff:127.0.0.1" → "127.0.0.1"; at most 64 characters. */
function normaliseIp(ip: string | undefined): string {
  return (ip ?? '').replace(/^::ffff:(?=\d+\.\d+\.\d+\.\d+$)/, '').slice(0, 64);
}

/**
 * Starts a session for a user: stores its row and returns the signed token for the cookie.
 * @param transaction - the transaction of a change that signs the user in (password reset), if any
 */
export async function createSession(userId: number, origin: SessionOrigin = {}, transaction?: Transaction): Promise<string> {
  const { sessionHours } = getConfig();
  const sessionId = randomBytes(32).toString('base64url');
  const now = new Date();
  const lifetimeS = Math.round(sessionHours * 3600);
  await Session.create(
    {
      tokenHash: hashSessionId(sessionId),
      userId,
      lastSeenAt: now,
      expiresAt: new Date(now.getTime() + lifetimeS * 1000),
      revokedAt: null,
      revokedReason: null,
      userAgent: summariseUserAgent(origin.userAgent).slice(0, 120),
      ip: normaliseIp(origin.ip),
    },
    { transaction },
  );
  // Housekeeping: a few rows of sessions that ended a week ago (indexed, bounded work).
  await Session.destroy({ where: { expiresAt: { [Op.lt]: new Date(now.getTime() - KEEP_ENDED_MS) } }, limit: 50, transaction });
  return jwt.sign({ sid: sessionId }, sessionKey(), { algorithm: 'HS256', subject: String(userId), expiresIn: lifetimeS });
}

/** Cookie options for setting (with Max-Age) or clearing the session cookie. */
export function sessionCookieOptions(forClearing = false): CookieOptions {
  const { sessionHours, appUrl } = getConfig();
  // Strict: a request another site starts (a link, a form, a script) never carries the session (issue 12, CSRF).
  const base: CookieOptions = { httpOnly: true, sameSite: 'strict', path: '/', secure: appUrl.startsWith('https://') };
  return forClearing ? base : { ...base, maxAge: Math.round(sessionHours * 3600 * 1000) };
}

/** A signed-in request: who, and which of their sessions. */
export type SessionContext = { user: PublicUser; sessionId: number };

/** The claims a valid session token carries, or null. A token without `exp` or `sid` is refused. */
function verifyToken(token: string): { userId: number; sid: string } | null {
  let payload: string | jwt.JwtPayload;
  try {
    payload = jwt.verify(token, sessionKey(), { algorithms: ['HS256'] });
  } catch {
    return null;
  }
  if (typeof payload !== 'object' || typeof payload.exp !== 'number' || typeof payload.sid !== 'string' || !payload.sid) return null;
  const userId = Number(payload.sub);
  if (!Number.isSafeInteger(userId) || userId <= 0) return null;
  return { userId, sid: payload.sid };
}

/** One row of {@link SESSION_QUERY}: the open session and its active user. */
interface SessionUserRow {
  sessionId: number;
  lastSeenAt: Date | string;
  id: number;
  email: string;
  name: string;
  passwordHash: string | null;
  roles: unknown;
  disabled: number | boolean;
  createdAt: Date | string;
}

/**
 * The session check of every signed-in request, as one plain query: the same conditions as before (open, not expired,
 * the user not disabled), but without building model instances for a join, which cost more CPU on the event loop
 * than the query itself (issue 11).
 */
const SESSION_QUERY =
  'SELECT `s`.`id` AS `sessionId`, `s`.`last_seen_at` AS `lastSeenAt`, `u`.`id`, `u`.`email`, `u`.`name`, ' +
  '`u`.`password_hash` AS `passwordHash`, `u`.`roles`, `u`.`disabled`, `u`.`created_at` AS `createdAt` ' +
  'FROM `sessions` AS `s` INNER JOIN `users` AS `u` ON `u`.`id` = `s`.`user_id` ' +
  'WHERE `s`.`token_hash` = ? AND `s`.`user_id` = ? AND `s`.`revoked_at` IS NULL AND `s`.`expires_at` > ? AND `u`.`disabled` = 0 ' +
  'LIMIT 1';

/**
 * Resolves a session token to the current user and session. The session row and the user row are read in one
 * query on every request, so a revoked session, a disabled account or a deleted user loses access at once.
 * @returns null when the token is missing, invalid, has no expiry, or its session has ended.
 */
export async function readSession(token: string | undefined): Promise<SessionContext | null> {
  if (!token) return null;
  const claims = verifyToken(token);
  if (!claims) return null;
  const now = new Date();
  const [row] = await getSequelize().query<SessionUserRow>(SESSION_QUERY, {
    replacements: [hashSessionId(claims.sid), claims.userId, now],
    type: QueryTypes.SELECT,
  });
  if (!row) return null;
  if (now.getTime() - new Date(row.lastSeenAt).getTime() > LAST_SEEN_RESOLUTION_MS) {
    await Session.update({ lastSeenAt: now }, { where: { id: row.sessionId } });
  }
  // The JSON column arrives parsed or as text, depending on the server's column metadata.
  const roles: unknown = typeof row.roles === 'string' ? JSON.parse(row.roles) : row.roles;
  return { user: toPublicUser({ ...row, roles }), sessionId: row.sessionId };
}

/** Ends one session of a user. @returns whether it was still open */
export async function revokeSession(userId: number, sessionId: number, reason: SessionRevokeReason): Promise<boolean> {
  const [affected] = await Session.update(
    { revokedAt: new Date(), revokedReason: reason },
    { where: { id: sessionId, userId, revokedAt: null } },
  );
  return affected > 0;
}

/**
 * Ends every open session of a user (password changed, account disabled, "sign out everywhere").
 * @returns how many were open
 */
export async function revokeAllSessions(userId: number, reason: SessionRevokeReason, transaction?: Transaction): Promise<number> {
  const [affected] = await Session.update(
    { revokedAt: new Date(), revokedReason: reason },
    { where: { userId, revokedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction },
  );
  return affected;
}

/** The user's open sessions, most recently used first. */
export async function listSessions(context: SessionContext): Promise<Page<SessionItem>> {
  const rows = await Session.findAll({
    where: { userId: context.user.id, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    order: [
      ['lastSeenAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: 100,
  });
  const items = rows.map((row) => ({
    id: row.id,
    createdAt: new Date(row.createdAt).toISOString(),
    lastSeenAt: new Date(row.lastSeenAt).toISOString(),
    expiresAt: new Date(row.expiresAt).toISOString(),
    userAgent: row.userAgent,
    ip: row.ip,
    isCurrent: row.id === context.sessionId,
  }));
  return { items, total: items.length, page: 1, pageSize: Math.max(items.length, 1) };
}

/** Ends the session a token names, if it is open (POST /api/auth/logout; a stale or missing cookie is fine). */
export async function signOut(token: string | undefined): Promise<void> {
  const session = await readSession(token);
  if (session) await revokeSession(session.user.id, session.sessionId, 'signed_out');
}

/** "Sign out everywhere": ends every open session of the signed-in user, this one too. @returns how many */
export async function signOutEverywhere(context: SessionContext): Promise<number> {
  return revokeAllSessions(context.user.id, 'signed_out_everywhere');
}

/** Ends one of the signed-in user's own sessions. @throws 404 when it is not theirs or already ended */
export async function endOwnSession(context: SessionContext, sessionId: number): Promise<{ wasCurrent: boolean }> {
  const reason: SessionRevokeReason = sessionId === context.sessionId ? 'signed_out' : 'signed_out_elsewhere';
  if (!(await revokeSession(context.user.id, sessionId, reason))) throw notFound('Session');
  return { wasCurrent: sessionId === context.sessionId };
}
