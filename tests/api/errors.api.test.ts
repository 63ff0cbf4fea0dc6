import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
let admin: Agent;

beforeAll(async () => {
  ({ agent: admin } = await signedInAs(app, ['admin']));
});
afterAll(() => closeSequelize());

describe('unknown routes', () => {
  it.each(['get', 'post', 'patch', 'delete'] as const)(
    'when %s goes to an unknown /api path, then 404 JSON names the route',
    async (method) => {
      const res = await request(app)[method]('/api/no-such-thing/42');
      expect(res.status).toBe(404);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(res.body).toEqual({
        error: { code: 'not_found', message: `No API route for ${method.toUpperCase()} /api/no-such-thing/42.` },
      });
    },
  );

  it('when a missing static file is requested, then 404 JSON, not the app shell', async () => {
    const res = await request(app).get('/assets/no-such-file.js');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('request bodies', () => {
  it('when the JSON is malformed, then 400 invalid_json', async () => {
    const res = await request(app).post('/api/auth/login').set('Content-Type', 'application/json').send('{"email": "a@example.test", ');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({ error: { code: 'invalid_json', message: 'The request body is not valid JSON.' } });
  });

  it('when the JSON body is a bare value instead of an object, then 400 invalid_json', async () => {
    const res = await request(app).post('/api/auth/login').set('Content-Type', 'application/json').send('"just a string"');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_json');
  });

  it('when the body is larger than 1 MB, then 413 payload_too_large', async () => {
    const big = JSON.stringify({ email: 'a@example.test', password: 'x'.repeat(1024 * 1024 + 10) });
    const res = await request(app).post('/api/auth/login').set('Content-Type', 'application/json').send(big);
    expect(res.status).toBe(413);
    expect(res.body.error).toEqual({ code: 'payload_too_large', message: 'The request body is too large (limit 1 MB).' });
  });

  it('when the body is not JSON (text/plain), then 415 unsupported_media_type', async () => {
    const res = await request(app).post('/api/auth/login').set('Content-Type', 'text/plain').send('email=a');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
  });

  it('when the body is missing, then 400 says the body must be a JSON object', async () => {
    const res = await request(app).post('/api/auth/login');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'body', message: 'must be a JSON object' }]);
  });
});

describe('validation errors', () => {
  it('when fields are invalid, then 400 validation_failed lists each field path', async () => {
    const res = await request(app).post('/api/auth/login').send({ email: 'not-an-address', password: '' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toEqual([
      { path: 'email', message: 'must be an e-mail address' },
      { path: 'password', message: 'is required' },
    ]);
  });

  it('when an array item is invalid, then the path names its index', async () => {
    const res = await admin.post('/api/users').send({ email: 'valid-x@example.test', name: 'X', roles: ['designer', 'pilot'] });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'roles.1', message: 'must be one of admin, designer, reviewer, maker' }]);
  });

  it('when an unknown field is sent, then its path is reported as not a known field', async () => {
    const res = await admin.post('/api/users').send({ email: 'valid-y@example.test', name: 'Y', roles: [], isRoot: true });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'isRoot', message: 'is not a known field' }]);
  });

  it('when a query parameter is out of range, then its name is the path', async () => {
    const res = await admin.get('/api/users?page=0&pageSize=500');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'page', message: 'must be 1 or more' },
      { path: 'pageSize', message: 'must be 100 or less' },
    ]);
  });

  it.each(['abc', '1.5', '-3', '1e3', '0x10', '0', '99999999999'])('when :id is "%s", then 400 with path id', async (id) => {
    const res = await admin.patch(`/api/users/${id}`).send({ name: 'Whoever' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details[0].path).toBe('id');
  });
});
