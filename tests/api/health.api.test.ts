import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, afterEach, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize, getSequelize } from '../../server/db';
import { ROOT_DIR } from '../../server/paths';

const app = createApp();
afterEach(() => vi.restoreAllMocks());
afterAll(() => closeSequelize());

describe('GET /api/health', () => {
  it('when the database answers, then 200 with status ok, db up, the package version and the outbox flag', async () => {
    const version = (JSON.parse(fs.readFileSync(path.join(ROOT_DIR, 'package.json'), 'utf8')) as { version: string }).version;

    const res = await request(app).get('/api/health');

    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'up', version, outbox: true });
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('when the database query fails, then 503 with status degraded and db down', async () => {
    vi.spyOn(getSequelize(), 'query').mockRejectedValueOnce(new Error('connection refused'));

    const res = await request(app).get('/api/health');

    expect(res.status).toBe(503);
    expect(res.body).toMatchObject({ status: 'degraded', db: 'down' });
  });

  it('when called without a session, then it still answers (no sign-in needed)', async () => {
    const res = await request(app).get('/api/health').set('Cookie', 'gw_session=garbage');
    expect(res.status).toBe(200);
  });
});

describe('request ids', () => {
  it('when a request has no X-Request-Id, then the response carries a fresh one', async () => {
    const first = await request(app).get('/api/health');
    const second = await request(app).get('/api/health');
    expect(first.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    expect(second.headers['x-request-id']).not.toBe(first.headers['x-request-id']);
  });

  it('when a sane X-Request-Id comes in, then it is echoed; when it is unsafe, then it is replaced', async () => {
    const kept = await request(app).get('/api/health').set('X-Request-Id', 'lb-1234.abc');
    const replaced = await request(app).get('/api/health').set('X-Request-Id', 'bad id with spaces\t<script>');
    expect(kept.headers['x-request-id']).toBe('lb-1234.abc');
    expect(replaced.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  });
});

describe('security headers', () => {
  it('when any page is served, then a CSP allowing only own scripts (plus inline styles and data:/blob: images) is set', async () => {
    const res = await request(app).get('/api/health');
    const csp = res.headers['content-security-policy'] as string;
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe/);
    expect(csp).toContain("style-src 'self' 'unsafe-inline'");
    expect(csp).toContain("img-src 'self' data: blob:");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});
