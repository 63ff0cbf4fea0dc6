import { randomBytes } from 'node:crypto';
import { threadId } from 'node:worker_threads';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createApp } from '../../server/app';
import { getConfig, resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { Notification, PasswordToken } from '../../server/models';
import { hashPassword } from '../../server/services/auth.service';
import { passwordPoolThreadId, compareInPool } from '../../server/workers/passwordPool';
import { createUser, fetchOutbox, uniqueEmail, waitForMail } from '../helpers/factories';

/**
 * Sign-in and reset abuse (issue 12, item 5). This file builds its own app with small per-address limits and trusts
 * the loopback proxy, so each test can speak from an address of its own (X-Forwarded-For) and never trips the
 * limits of the other test files, which all come from 127.0.0.1.
 */
const SAVED = { ...process.env };
let app: Express;

beforeAll(() => {
  Object.assign(process.env, { TRUST_PROXY: 'loopback', LOGIN_IP_RATE_LIMIT: '8', RESET_IP_RATE_LIMIT: '6', RESET_RATE_LIMIT: '3' });
  resetConfigCache();
  app = createApp();
});
afterAll(async () => {
  process.env = SAVED;
  resetConfigCache();
  await closeSequelize();
});

/**
 * A documentation address (RFC 5737) no other test uses, each call a new one: a random pick among 250 used to repeat
 * an address an earlier test had already pushed over its limit. A run asks for far fewer than 250.
 */
let nextIp = randomBytes(1)[0];
const freshIp = () => {
  nextIp += 1;
  return `198.51.100.${1 + (nextIp % 250)}`;
};
const fromIp = (ip: string) => ({ post: (path: string) => request(app).post(path).set('X-Forwarded-For', ip) });

describe('sign-in limits', () => {
  // fix: #12 — random e-mails were never limited: each guess cost a bcrypt on the server.
  it('when one address tries many different e-mails, then after LOGIN_IP_RATE_LIMIT failures it gets 429, even for a real account', async () => {
    // Arrange
    const ip = `203.0.113.${1 + (randomBytes(1)[0] % 250)}`;
    const real = await createUser({ roles: ['maker'] });
    const limit = getConfig().loginIpRateLimit;
    // Act
    const guesses = await Promise.all(
      Array.from({ length: limit }, () =>
        fromIp(ip)
          .post('/api/auth/login')
          .send({ email: uniqueEmail('guess'), password: 'not-a-password' }),
      ),
    );
    const blocked = await fromIp(ip).post('/api/auth/login').send({ email: real.email, password: real.password });
    const elsewhere = await fromIp(freshIp()).post('/api/auth/login').send({ email: real.email, password: real.password });
    // Assert
    expect(guesses.map((g) => g.status)).toEqual(Array(limit).fill(401));
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    expect(blocked.body.error.message).toMatch(/^Too many sign-in attempts from your network\. Try again in \d+ minutes?\.$/);
    expect(elsewhere.status).toBe(200);
  });

  it('when sign-ins from one address succeed, then they do not count toward its limit', async () => {
    const ip = freshIp().replace('198.51.100', '192.0.2');
    const user = await createUser({ roles: ['maker'] });
    const statuses = [];
    for (let i = 0; i < getConfig().loginIpRateLimit + 2; i += 1)
      statuses.push((await fromIp(ip).post('/api/auth/login').send({ email: user.email, password: user.password })).status);
    expect(statuses.every((s) => s === 200)).toBe(true);
  });
});

describe('bcrypt runs off the event loop', () => {
  // fix: #12 — bcrypt ran on the event loop, so 20 parallel sign-ins made everyone else wait 1.2 s.
  it('when a password is hashed or checked, then a worker thread does it and the result is a normal bcrypt hash', async () => {
    // Act
    const worker = await passwordPoolThreadId();
    const hash = await hashPassword('larch-gantry-pulley-77');
    // Assert
    expect(worker).not.toBe(threadId);
    expect(hash).toMatch(/^\$2[aby]\$\d{2}\$/);
    expect(await compareInPool('larch-gantry-pulley-77', hash)).toBe(true);
    expect(await compareInPool('larch-gantry-pulley-78', hash)).toBe(false);
  });

  it('when a password longer than 72 bytes starts with the real one, then it does not sign in (bcrypt would read only 72)', async () => {
    // Arrange
    const exact = 'p'.repeat(72);
    const user = await createUser({ roles: ['maker'], password: exact });
    // Act
    const longer = await fromIp(freshIp())
      .post('/api/auth/login')
      .send({ email: user.email, password: `${exact}-and-more` });
    const right = await fromIp(freshIp()).post('/api/auth/login').send({ email: user.email, password: exact });
    // Assert
    expect(longer.status).toBe(401);
    expect(right.status).toBe(200);
  });
});

describe('forgot-password', () => {
  // fix: #12 — 30 requests sent 30 mails.
  it('when one address is asked for 30 times, then at most RESET_RATE_LIMIT mails go out and the rest get 429', async () => {
    // Arrange
    const { email } = await createUser({ roles: ['maker'] });
    // Act
    const answers = [];
    for (let i = 0; i < 30; i += 1) answers.push(await fromIp(freshIp()).post('/api/auth/forgot').send({ email }));
    await waitForMail(email, 'Reset your Gantrywright password');
    // Assert
    const limit = getConfig().resetRateLimit;
    expect(answers.filter((a) => a.status === 202)).toHaveLength(limit);
    expect(answers.filter((a) => a.status === 429)).toHaveLength(30 - limit);
    expect(answers.find((a) => a.status === 429)!.body.error.message).toMatch(/^Too many password-reset requests\. Try again in/);
    await expect.poll(async () => (await fetchOutbox(email)).length, { timeout: 10_000 }).toBe(limit);
  });

  it('when one client asks for many different addresses, then it is limited too', async () => {
    const ip = freshIp();
    const statuses = [];
    for (let i = 0; i < getConfig().resetIpRateLimit + 2; i += 1)
      statuses.push(
        (
          await fromIp(ip)
            .post('/api/auth/forgot')
            .send({ email: uniqueEmail('ask') })
        ).status,
      );
    expect(statuses.slice(0, getConfig().resetIpRateLimit).every((s) => s === 202)).toBe(true);
    expect(statuses.slice(-2)).toEqual([429, 429]);
  });

  // fix: #12 — the answer's timing told whether an account exists (the known one created a token and a mail first).
  it('when a known and an unknown address ask, then the request does the same for both: one queued request, no token yet', async () => {
    // Arrange
    const known = await createUser({ roles: ['maker'] });
    const unknown = uniqueEmail('nobody');
    // Act
    const a = await fromIp(freshIp()).post('/api/auth/forgot').send({ email: known.email });
    const b = await fromIp(freshIp()).post('/api/auth/forgot').send({ email: unknown });
    // Assert: the answers are the same, and each left exactly one queued request with no link in it
    expect(a.status).toBe(202);
    expect(b.body).toEqual(a.body);
    const rows = await Notification.findAll({ where: { toAddress: [known.email, unknown] }, order: [['id', 'ASC']] });
    expect(rows.map((r) => [r.kind, r.subject, r.textBody])).toEqual([
      ['auth.reset', 'Reset your Gantrywright password', ''],
      ['auth.reset', 'Reset your Gantrywright password', ''],
    ]);
    // Then the queue sends the known one and discards the other.
    await waitForMail(known.email, 'Reset');
    await expect
      .poll(async () => (await Notification.findOne({ where: { toAddress: unknown } }))!.status, { timeout: 10_000 })
      .toBe('discarded');
    expect(await PasswordToken.count({ where: { userId: known.user.id } })).toBe(1);
    expect(await fetchOutbox(unknown)).toEqual([]);
  });
});
