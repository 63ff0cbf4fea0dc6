import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize, getSequelize } from '../../server/db';
import { Session } from '../../server/models';
import { hashSessionId } from '../../server/services/session.service';
import { createUser, signIn, signedInAs, tokenFromMail, waitForMail } from '../helpers/factories';

/** Sessions are rows in MariaDB that end on sign-out, password change, disable and "sign out everywhere" (issue 12, item 4). */
const app = createApp();
afterAll(() => closeSequelize());

/** The raw session token an agent carries. */
function tokenOf(res: request.Response): string {
  const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('gw_session='));
  if (!cookie) throw new Error('no session cookie');
  return decodeURIComponent(cookie.split(';')[0].slice('gw_session='.length));
}

/** Signs in and returns the token itself, to replay it later as a stolen cookie would be. */
async function signInForToken(
  email: string,
  password: string,
  userAgent = 'Mozilla/5.0 (X11; Linux x86_64; rv:128.0) Gecko/20100101 Firefox/128.0',
) {
  const res = await request(app).post('/api/auth/login').set('User-Agent', userAgent).send({ email, password });
  expect(res.status).toBe(200);
  return tokenOf(res);
}

const meWith = (token: string) => request(app).get('/api/auth/me').set('Cookie', `gw_session=${token}`);

describe('session rows', () => {
  it('when someone signs in, then a session row records when, from what and until when, storing only a hash of its id', async () => {
    // Arrange
    const { user, email, password } = await createUser({ roles: ['maker'] });
    // Act
    const token = await signInForToken(email, password);
    // Assert
    const claims = jwt.decode(token) as { sid: string; sub: string; exp: number };
    const row = await Session.findOne({ where: { userId: user.id } });
    expect(claims.sub).toBe(String(user.id));
    expect(typeof claims.exp).toBe('number');
    expect(row).not.toBeNull();
    expect(row!.tokenHash).toBe(hashSessionId(claims.sid));
    expect(row!.tokenHash).not.toContain(claims.sid);
    expect(row!.userAgent).toBe('Firefox on Linux');
    expect(row!.ip).toBe('127.0.0.1');
    expect(row!.revokedAt).toBeNull();
    expect(Math.abs(row!.expiresAt.getTime() - claims.exp * 1000)).toBeLessThan(2000);
  });

  it('when a signed-in request is authenticated, then the user and the session are read in one query', async () => {
    // Arrange
    const { agent } = await signedInAs(app, ['designer']);
    const sequelize = getSequelize();
    const seen: string[] = [];
    const previous = sequelize.options.logging;
    sequelize.options.logging = (sql: string) => void seen.push(sql);
    // Act
    const res = await agent.get('/api/auth/me');
    sequelize.options.logging = previous;
    // Assert
    expect(res.status).toBe(200);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatch(/FROM `sessions`[\s\S]*JOIN `users`/);
  });
});

describe('revocation', () => {
  // fix: #12 — after logout the old token still worked for 12 h.
  it('when the user signs out, then the old token is refused although it has not expired', async () => {
    // Arrange
    const { email, password } = await createUser({ roles: ['maker'] });
    const token = await signInForToken(email, password);
    expect((await meWith(token)).status).toBe(200);
    // Act
    const logout = await request(app).post('/api/auth/logout').set('Cookie', `gw_session=${token}`);
    // Assert
    expect(logout.status).toBe(204);
    expect((await meWith(token)).status).toBe(401);
    expect(
      (await Session.findOne({ where: { tokenHash: hashSessionId((jwt.decode(token) as { sid: string }).sid) } }))?.revokedReason,
    ).toBe('signed_out');
  });

  // fix: #12 — after a password reset the old sessions kept working.
  it('when the password is reset, then every earlier session ends and the new one works', async () => {
    // Arrange
    const { email, password } = await createUser({ roles: ['maker'] });
    const first = await signInForToken(email, password);
    const second = await signInForToken(email, password, 'curl/8.5.0');
    await request(app).post('/api/auth/forgot').send({ email });
    const resetToken = tokenFromMail(await waitForMail(email, 'Reset'));
    // Act
    const reset = await request(app).post('/api/auth/reset').send({ token: resetToken, password: 'larch-gantry-pulley-77' });
    // Assert
    expect(reset.status).toBe(200);
    expect((await meWith(first)).status).toBe(401);
    expect((await meWith(second)).status).toBe(401);
    expect((await meWith(tokenOf(reset))).status).toBe(200);
  });

  it('when an admin disables an account, then its sessions are revoked, and enabling it again does not revive them', async () => {
    // Arrange
    const admin = await signedInAs(app, ['admin']);
    const { user, email, password } = await createUser({ roles: ['designer'] });
    const token = await signInForToken(email, password);
    // Act
    await admin.agent.patch(`/api/users/${user.id}`).send({ disabled: true });
    await admin.agent.patch(`/api/users/${user.id}`).send({ disabled: false });
    // Assert
    expect((await meWith(token)).status).toBe(401);
    const rows = await Session.findAll({ where: { userId: user.id } });
    expect(rows.map((r) => r.revokedReason)).toEqual(['disabled']);
  });

  // fix: #12 — a token without `exp` was accepted.
  it.each([
    ['has no expiry', (userId: number, sid: string) => jwt.sign({ sid }, getConfig().jwtSecret, { subject: String(userId) })],
    [
      'has no session id (the old format)',
      (userId: number) => jwt.sign({}, getConfig().jwtSecret, { subject: String(userId), expiresIn: 600 }),
    ],
    [
      'names another user than its session',
      (_userId: number, sid: string, otherId: number) =>
        jwt.sign({ sid }, getConfig().jwtSecret, { subject: String(otherId), expiresIn: 600 }),
    ],
  ])('when a correctly signed token %s, then it is refused', async (_label, makeToken) => {
    // Arrange
    const { user, email, password } = await createUser({ roles: ['admin'] });
    const other = await createUser({ roles: ['admin'] });
    const sid = (jwt.decode(await signInForToken(email, password)) as { sid: string }).sid;
    // Act
    const res = await meWith(makeToken(user.id, sid, other.user.id));
    // Assert
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });
});

describe('GET and DELETE /api/auth/sessions', () => {
  it('when a user has signed in twice, then the list shows both open sessions, marks this one, and shows no one else’s', async () => {
    // Arrange
    const { user, email, password } = await createUser({ roles: ['reviewer'] });
    await signInForToken(email, password, 'curl/8.5.0');
    const agent = await signIn(app, email, password);
    const stranger = await createUser({ roles: ['reviewer'] });
    await signInForToken(stranger.email, stranger.password);
    // Act
    const res = await agent.get('/api/auth/sessions');
    // Assert
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect(res.body.items.filter((s: { isCurrent: boolean }) => s.isCurrent)).toHaveLength(1);
    expect(res.body.items.map((s: { userAgent: string }) => s.userAgent).sort()).toEqual(['Unknown client', 'curl']);
    const ids = (await Session.findAll({ where: { userId: user.id } })).map((r) => r.id).sort();
    expect(res.body.items.map((s: { id: number }) => s.id).sort()).toEqual(ids);
    expect(res.body.items[0]).toEqual(
      expect.objectContaining({
        createdAt: expect.any(String),
        lastSeenAt: expect.any(String),
        expiresAt: expect.any(String),
        ip: '127.0.0.1',
      }),
    );
  });

  it('when the user ends another of their sessions, then that one is refused and this one goes on; a stranger’s id is 404', async () => {
    // Arrange
    const { email, password } = await createUser({ roles: ['maker'] });
    const elsewhere = await signInForToken(email, password);
    const agent = await signIn(app, email, password);
    const list = await agent.get('/api/auth/sessions');
    const other = list.body.items.find((s: { isCurrent: boolean }) => !s.isCurrent);
    const stranger = await createUser({ roles: ['maker'] });
    await signInForToken(stranger.email, stranger.password);
    const strangerSession = await Session.findOne({ where: { userId: stranger.user.id } });
    // Act
    const ended = await agent.delete(`/api/auth/sessions/${other.id}`);
    const foreign = await agent.delete(`/api/auth/sessions/${strangerSession!.id}`);
    // Assert
    expect(ended.status).toBe(204);
    expect(foreign.status).toBe(404);
    expect((await meWith(elsewhere)).status).toBe(401);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    expect((await Session.findByPk(strangerSession!.id))!.revokedAt).toBeNull();
  });

  it('when the user signs out everywhere, then every session of theirs ends, this one too, and the cookie is cleared', async () => {
    // Arrange
    const { email, password } = await createUser({ roles: ['maker'] });
    const elsewhere = await signInForToken(email, password);
    const agent = await signIn(app, email, password);
    // Act
    const res = await agent.delete('/api/auth/sessions');
    // Assert
    expect(res.status).toBe(204);
    expect(([] as string[]).concat(res.headers['set-cookie'] ?? []).join()).toMatch(/gw_session=;/);
    expect((await meWith(elsewhere)).status).toBe(401);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });

  it('when nobody is signed in, then the sessions routes answer 401', async () => {
    expect((await request(app).get('/api/auth/sessions')).status).toBe(401);
    expect((await request(app).delete('/api/auth/sessions')).status).toBe(401);
    expect((await request(app).delete('/api/auth/sessions/1')).status).toBe(401);
  });
});
