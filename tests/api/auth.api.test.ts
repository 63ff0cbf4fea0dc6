import { createHash } from 'node:crypto';
import jwt from 'jsonwebtoken';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize, getSequelize } from '../../server/db';
import { PasswordToken, User } from '../../server/models';
import { hashToken } from '../../server/services/passwordToken.service';
import { createUser, fetchOutbox, signIn, tokenFromMail, uniqueEmail, waitForMail } from '../helpers/factories';

const app = createApp();
afterAll(() => closeSequelize());

const INVALID = { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password.' } };

function sessionCookie(res: request.Response): string {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const found = cookies.find((c) => c.startsWith('gw_session='));
  if (!found) throw new Error('no gw_session cookie set');
  return found;
}

describe('POST /api/auth/login', () => {
  it('when e-mail and password match, then 200 with the user and an httpOnly SameSite=Strict session cookie with Max-Age', async () => {
    const { user, email, password } = await createUser({ roles: ['designer', 'reviewer'] });

    const res = await request(app).post('/api/auth/login').send({ email, password });

    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      user: {
        id: user.id,
        email,
        name: user.name,
        roles: ['designer', 'reviewer'],
        disabled: false,
        isInvited: false,
        createdAt: user.createdAt,
      },
    });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const cookie = sessionCookie(res);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
    expect(cookie).toMatch(/Path=\//);
    expect(cookie).toMatch(new RegExp(`Max-Age=${getConfig().sessionHours * 3600}`));
  });

  it('when the e-mail differs only in case and spaces, then sign-in still works', async () => {
    const { email, password } = await createUser();
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email: `  ${email.toUpperCase()} `, password });
    expect(res.status).toBe(200);
  });

  it('when the password is wrong or the e-mail unknown, then both answers are the same 401', async () => {
    const { email } = await createUser();

    const wrongPassword = await request(app).post('/api/auth/login').send({ email, password: 'not-the-password' });
    const unknownEmail = await request(app)
      .post('/api/auth/login')
      .send({ email: uniqueEmail('ghost'), password: 'not-the-password' });

    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    expect(wrongPassword.body).toEqual(INVALID);
    expect(unknownEmail.body).toEqual(wrongPassword.body);
    expect(wrongPassword.headers['set-cookie']).toBeUndefined();
  });

  it('when the account is disabled, then the right password gets the same generic 401', async () => {
    const { email, password } = await createUser({ roles: ['maker'], disabled: true });
    const res = await request(app).post('/api/auth/login').send({ email, password });
    expect(res.status).toBe(401);
    expect(res.body).toEqual(INVALID);
  });

  it('when an invited user has not set a password yet, then any password gets the generic 401', async () => {
    const { email } = await createUser({ password: null });
    const res = await request(app)
      .post('/api/auth/login')
      .send({ email, password: '' + 'anything-at-all' });
    expect(res.body).toEqual(INVALID);
  });
});

describe('login rate limit', () => {
  it('when failed sign-ins exceed LOGIN_RATE_LIMIT, then 429 rate_limited, even with the right password', async () => {
    const { email, password } = await createUser();
    const limit = getConfig().loginRateLimit;

    const failures = [];
    for (let i = 0; i < limit; i += 1)
      failures.push((await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' })).status);
    const blocked = await request(app).post('/api/auth/login').send({ email, password });

    expect(failures).toEqual(Array(limit).fill(401));
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
    expect(blocked.body.error.message).toBe(`Too many sign-in attempts. Try again in ${getConfig().loginRateWindowMinutes} minutes.`);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('when one e-mail is blocked, then another e-mail from the same address can still sign in', async () => {
    const blockedUser = await createUser();
    const other = await createUser();
    for (let i = 0; i <= getConfig().loginRateLimit; i += 1)
      await request(app).post('/api/auth/login').send({ email: blockedUser.email, password: 'wrong-password' });

    const res = await request(app).post('/api/auth/login').send({ email: other.email, password: other.password });

    expect(res.status).toBe(200);
  });

  it('when sign-ins succeed, then they do not count toward the limit', async () => {
    const { email, password } = await createUser();
    const statuses = [];
    for (let i = 0; i < getConfig().loginRateLimit + 2; i += 1)
      statuses.push((await request(app).post('/api/auth/login').send({ email, password })).status);
    expect(statuses.every((s) => s === 200)).toBe(true);
  });

  it('when attempts are counted, then the counter lives in MariaDB (shared by every API process), keyed by a hash', async () => {
    const { email } = await createUser();
    await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' });
    await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' });

    const key = `login:${createHash('sha256').update(`127.0.0.1|${email}`).digest('hex')}`;
    const rows = await getSequelize().query<{ hits: number }>('SELECT hits FROM rate_limit_hits WHERE `key` = ?', {
      replacements: [key],
      type: QueryTypes.SELECT,
    });

    expect(rows).toEqual([{ hits: 2 }]);
  });
});

describe('sessions: GET /api/auth/me and POST /api/auth/logout', () => {
  it('when signed in, then /me returns the user; after logout 204 the cookie is cleared and /me is 401', async () => {
    const { email, password, user } = await createUser({ roles: ['maker'] });
    const agent = await signIn(app, email, password);

    const me = await agent.get('/api/auth/me');
    const logout = await agent.post('/api/auth/logout');
    const after = await agent.get('/api/auth/me');

    expect(me.status).toBe(200);
    expect(me.body.user.id).toBe(user.id);
    expect(logout.status).toBe(204);
    expect(sessionCookie(logout)).toMatch(/gw_session=;.*Expires=Thu, 01 Jan 1970/);
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('unauthenticated');
  });

  it('when there is no cookie, then /me is 401', async () => {
    const res = await request(app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body).toEqual({ error: { code: 'unauthenticated', message: 'Sign in first.' } });
  });

  it.each([
    ['garbage', () => 'not-a-jwt'],
    ['signed with another secret', (id: number) => jwt.sign({}, 'x'.repeat(40), { subject: String(id), expiresIn: 600 })],
    ['expired', (id: number) => jwt.sign({ exp: Math.floor(Date.now() / 1000) - 60 }, getConfig().jwtSecret, { subject: String(id) })],
    ['using alg none', (id: number) => jwt.sign({ sub: String(id) }, '', { algorithm: 'none' })],
    ['for a user that does not exist', () => jwt.sign({}, getConfig().jwtSecret, { subject: '2147483000', expiresIn: 600 })],
  ])('when the session cookie is %s, then /me is 401', async (_label, makeToken) => {
    const { user } = await createUser();
    const res = await request(app)
      .get('/api/auth/me')
      .set('Cookie', `gw_session=${makeToken(user.id)}`);
    expect(res.status).toBe(401);
  });

  it('when a signed-in user is disabled, then the existing session is refused on the next request', async () => {
    const { email, password, user } = await createUser({ roles: ['designer'] });
    const agent = await signIn(app, email, password);
    expect((await agent.get('/api/auth/me')).status).toBe(200);

    await User.update({ disabled: true }, { where: { id: user.id } });

    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });
});

describe('password reset', () => {
  it('when forgot is asked for a known and an unknown e-mail, then both get the same 202 and only the known one gets mail', async () => {
    const { email } = await createUser();
    const unknown = uniqueEmail('nobody');

    const unknownRes = await request(app).post('/api/auth/forgot').send({ email: unknown });
    const knownRes = await request(app).post('/api/auth/forgot').send({ email });
    const mail = await waitForMail(email, 'Reset your Gantrywright password');

    expect(unknownRes.status).toBe(202);
    expect(knownRes.status).toBe(202);
    expect(unknownRes.body).toEqual(knownRes.body);
    expect(mail.text).toContain(`${getConfig().appUrl}/reset?token=`);
    expect(mail.html).toContain(`${getConfig().appUrl}/reset?token=`);
    expect(await fetchOutbox(unknown)).toEqual([]);
  });

  it('when the reset link is used, then the new password works once; reusing the link fails with 400', async () => {
    const { email, password, user } = await createUser({ roles: ['maker'] });
    await request(app).post('/api/auth/forgot').send({ email });
    const token = tokenFromMail(await waitForMail(email, 'Reset'));
    const newPassword = 'brand-new-password-1';

    const reset = await request(app).post('/api/auth/reset').send({ token, password: newPassword });
    const reuse = await request(app).post('/api/auth/reset').send({ token, password: 'another-password-2' });
    const oldLogin = await request(app).post('/api/auth/login').send({ email, password });
    const newLogin = await request(app).post('/api/auth/login').send({ email, password: newPassword });

    expect(reset.status).toBe(200);
    expect(reset.body.user.id).toBe(user.id);
    expect(sessionCookie(reset)).toMatch(/^gw_session=[^;]+;/);
    expect(reuse.status).toBe(400);
    expect(reuse.body.error.code).toBe('invalid_token');
    expect(oldLogin.status).toBe(401);
    expect(newLogin.status).toBe(200);
  });

  it('when the token has expired, then reset fails with 400 and the password is unchanged', async () => {
    const { email, password } = await createUser();
    await request(app).post('/api/auth/forgot').send({ email });
    const token = tokenFromMail(await waitForMail(email, 'Reset'));
    await PasswordToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { tokenHash: hashToken(token) } });

    const res = await request(app).post('/api/auth/reset').send({ token, password: 'brand-new-password-1' });

    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({ code: 'invalid_token', message: 'This link is invalid, expired or already used. Ask for a new one.' });
    expect((await request(app).post('/api/auth/login').send({ email, password })).status).toBe(200);
  });

  it('when a reset token is stored, then only its SHA-256 is in the database and it expires after one hour', async () => {
    const { email, user } = await createUser();
    await request(app).post('/api/auth/forgot').send({ email });
    const token = tokenFromMail(await waitForMail(email, 'Reset'));

    const rows = await PasswordToken.findAll({ where: { userId: user.id } });

    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(rows[0].tokenHash).not.toContain(token);
    expect(rows[0].purpose).toBe('reset');
    const lifetimeMs = rows[0].expiresAt.getTime() - rows[0].createdAt.getTime();
    expect(Math.abs(lifetimeMs - 3600_000)).toBeLessThanOrEqual(2000);
    expect(Buffer.from(token, 'base64url')).toHaveLength(32);
  });

  it('when the account is disabled, then forgot creates no token', async () => {
    const { email, user } = await createUser({ disabled: true });
    const res = await request(app).post('/api/auth/forgot').send({ email });
    expect(res.status).toBe(202);
    expect(await PasswordToken.count({ where: { userId: user.id } })).toBe(0);
  });

  it('when the token is unknown or the new password too short, then 400 names the problem', async () => {
    const unknown = await request(app)
      .post('/api/auth/reset')
      .send({ token: 'A'.repeat(43), password: 'long-enough-password' });
    const short = await request(app)
      .post('/api/auth/reset')
      .send({ token: 'A'.repeat(43), password: 'short' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe('invalid_token');
    expect(short.status).toBe(400);
    expect(short.body.error.details).toEqual([{ path: 'password', message: 'must be at least 12 characters' }]);
  });

  it('when a forgot request has no valid e-mail, then 400 with path email', async () => {
    const res = await request(app).post('/api/auth/forgot').send({ email: 'nope' });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'email', message: 'must be an e-mail address' }]);
  });
});

describe('password policy on reset and invitation links', () => {
  async function resetLinkFor(roles: ('maker' | 'designer')[] = ['maker'], name?: string) {
    const created = await createUser({ roles, name });
    await request(app).post('/api/auth/forgot').send({ email: created.email });
    return { ...created, token: tokenFromMail(await waitForMail(created.email, 'Reset')) };
  }

  // fix: #12 — a 10-character common password, or one made of the user's own name, was accepted.
  it.each([
    ['a common password', 'qwerty123456', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['eleven characters', 'larch-gantr', 'must be at least 12 characters'],
    ['more than 72 bytes', 'ü'.repeat(40), 'must be at most 72 bytes (bcrypt reads no further); use fewer or plainer characters'],
  ])('when the new password is %s, then 400 names the password and says why', async (_label, password, message) => {
    const { token } = await resetLinkFor();
    const res = await request(app).post('/api/auth/reset').send({ token, password });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'password', message }]);
  });

  it('when the new password contains the user’s name or e-mail, then 400, and the link still works for a better one', async () => {
    // Arrange
    const { email, token } = await resetLinkFor(['maker'], 'Oskar Brightwater');
    const local = email.split('@')[0];
    // Act
    const withName = await request(app).post('/api/auth/reset').send({ token, password: 'brightwater builds gantries' });
    const withEmail = await request(app)
      .post('/api/auth/reset')
      .send({ token, password: `my ${local} password` });
    const good = await request(app).post('/api/auth/reset').send({ token, password: 'larch gantry pulley seventy' });
    // Assert
    expect(withName.status).toBe(400);
    expect(withName.body.error.details).toEqual([{ path: 'password', message: 'must not contain your name' }]);
    expect(withEmail.status).toBe(400);
    expect(withEmail.body.error.details).toContainEqual({ path: 'password', message: 'must not contain your e-mail address' });
    expect(good.status).toBe(200);
  });

  it('when a demo-style password shorter than 12 is already stored, then it still signs in (the policy applies when a password is set)', async () => {
    const { email } = await createUser({ password: 'gantry-demo' });
    expect((await request(app).post('/api/auth/login').send({ email, password: 'gantry-demo' })).status).toBe(200);
  });
});
