import { createHash } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit, type ClientRateLimitInfo, type Options, type Store } from 'express-rate-limit';
import { QueryTypes } from 'sequelize';
import { getConfig } from '../config';
import { getSequelize } from '../db';
import { AppError } from '../errors';

type HitRow = { hits: number; reset_at: Date | string };

const toDate = (value: Date | string): Date => (value instanceof Date ? value : new Date(`${value.replace(' ', 'T')}Z`));

/**
 * An express-rate-limit Store kept in MariaDB (`rate_limit_hits`), so every API process behind a load
 * balancer counts against the same limit and a restart forgets nothing. Keys are hashed: the table never
 * holds e-mail addresses or IPs in clear.
 */
export class MariaDbRateLimitStore implements Store {
  /** Counts are shared between processes (express-rate-limit uses this for its double-count check). */
  readonly localKeys = false;
  readonly prefix: string;
  private windowMs = 60_000;

  constructor(prefix: string) {
    this.prefix = prefix;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private storedKey(key: string): string {
    return `${this.prefix}:${createHash('sha256').update(key).digest('hex')}`;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows = await getSequelize().query<HitRow>('SELECT hits, reset_at FROM rate_limit_hits WHERE `key` = ? AND reset_at > ?', {
      replacements: [this.storedKey(key), new Date()],
      type: QueryTypes.SELECT,
    });
    return rows[0] ? { totalHits: Number(rows[0].hits), resetTime: toDate(rows[0].reset_at) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const sequelize = getSequelize();
    const stored = this.storedKey(key);
    const now = new Date();
    const resetAt = new Date(now.getTime() + this.windowMs);
    return sequelize.transaction(async (transaction) => {
      // One atomic upsert: a row whose window has passed starts again at 1. MariaDB evaluates the
      // assignments left to right, so `reset_at` in the first one is still the old value.
      await sequelize.query(
        'INSERT INTO rate_limit_hits (`key`, hits, reset_at) VALUES (?, 1, ?) ' +
          'ON DUPLICATE KEY UPDATE hits = IF(reset_at <= ?, 1, hits + 1), reset_at = IF(reset_at <= ?, ?, reset_at)',
        { replacements: [stored, resetAt, now, now, resetAt], transaction },
      );
      const rows = await sequelize.query<HitRow>('SELECT hits, reset_at FROM rate_limit_hits WHERE `key` = ?', {
        replacements: [stored],
        type: QueryTypes.SELECT,
        transaction,
      });
      // Housekeeping: drop a few long-expired counters (indexed on reset_at, bounded work).
      await sequelize.query('DELETE FROM rate_limit_hits WHERE reset_at < ? LIMIT 50', {
        replacements: [new Date(now.getTime() - 24 * 3600 * 1000)],
        transaction,
      });
      return { totalHits: Number(rows[0]?.hits ?? 1), resetTime: rows[0] ? toDate(rows[0].reset_at) : resetAt };
    });
  }

  async decrement(key: string): Promise<void> {
    await getSequelize().query('UPDATE rate_limit_hits SET hits = GREATEST(hits - 1, 0) WHERE `key` = ? AND reset_at > ?', {
      replacements: [this.storedKey(key), new Date()],
    });
  }

  async resetKey(key: string): Promise<void> {
    await getSequelize().query('DELETE FROM rate_limit_hits WHERE `key` = ?', { replacements: [this.storedKey(key)] });
  }

  async resetAll(): Promise<void> {
    await getSequelize().query('DELETE FROM rate_limit_hits WHERE `key` LIKE ?', { replacements: [`${this.prefix}:%`] });
  }
}

/** "Too many sign-in attempts. Try again in N minutes." for a reset time. */
export function retryMessage(resetTime: Date | undefined, now = new Date(), what = 'sign-in attempts'): string {
  const minutes = resetTime ? Math.max(1, Math.ceil((resetTime.getTime() - now.getTime()) / 60_000)) : 1;
  return `Too many ${what}. Try again in ${minutes} ${minutes === 1 ? 'minute' : 'minutes'}.`;
}

/** The e-mail of a request body, trimmed and lower-cased ('' when there is none). */
const emailOf = (req: Request) => (typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '');

/** Answers 429 `rate_limited` with Retry-After and "Too many <what>…". */
function refuseWith(what: string): Options['handler'] {
  return (req, res, next) => {
    const info = (req as typeof req & { rateLimit?: { resetTime?: Date } }).rateLimit;
    if (info?.resetTime) res.setHeader('Retry-After', String(Math.max(1, Math.ceil((info.resetTime.getTime() - Date.now()) / 1000))));
    next(new AppError('rate_limited', retryMessage(info?.resetTime, new Date(), what), 429));
  };
}

/**
 * Limits failed sign-ins per client IP whatever the e-mail (LOGIN_IP_RATE_LIMIT per LOGIN_RATE_WINDOW_MINUTES),
 * beside the per-account limit: guessing many addresses from one place, each check a bcrypt, was not limited at all
 * (issue 12, item 5). Successful sign-ins do not count, so a team behind one address signs in as usual.
 */
export function loginIpRateLimitMiddleware(): RequestHandler {
  const config = getConfig();
  return rateLimit({
    windowMs: config.loginRateWindowMinutes * 60_000,
    limit: config.loginIpRateLimit,
    store: new MariaDbRateLimitStore('login-ip'),
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? 'unknown'),
    handler: refuseWith('sign-in attempts from your network'),
  });
}

/**
 * Limits password-reset requests, successful or not: RESET_RATE_LIMIT per e-mail address (so nobody can flood an
 * inbox with reset mails) and RESET_IP_RATE_LIMIT per client IP, each per RESET_RATE_WINDOW_MINUTES. The answer over
 * the limit is the same whether the address has an account or not.
 */
export function resetRateLimitMiddleware(): RequestHandler[] {
  const config = getConfig();
  const common = {
    windowMs: config.resetRateWindowMinutes * 60_000,
    standardHeaders: 'draft-7' as const,
    legacyHeaders: false,
    handler: refuseWith('password-reset requests'),
  };
  return [
    rateLimit({
      ...common,
      limit: config.resetIpRateLimit,
      store: new MariaDbRateLimitStore('reset-ip'),
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? 'unknown'),
    }),
    rateLimit({
      ...common,
      limit: config.resetRateLimit,
      store: new MariaDbRateLimitStore('reset-email'),
      keyGenerator: (req) => emailOf(req),
    }),
  ];
}

/**
 * Limits failed sign-ins per client IP and e-mail (LOGIN_RATE_LIMIT per LOGIN_RATE_WINDOW_MINUTES).
 * Successful sign-ins do not count. Over the limit: 429 `rate_limited`, even with the right password.
 */
export function loginRateLimitMiddleware(): RequestHandler {
  const config = getConfig();
  return rateLimit({
    windowMs: config.loginRateWindowMinutes * 60_000,
    limit: config.loginRateLimit,
    store: new MariaDbRateLimitStore('login'),
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? 'unknown')}|${emailOf(req)}`,
    handler: refuseWith('sign-in attempts'),
  });
}
