import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { closeSequelize } from '../../server/db';
import { resetConfigCache } from '../../server/config';
import { signedInAs } from '../helpers/factories';

// This file runs in its own module graph (vitest isolates test files), so switching the process to
// production settings here does not affect the other API test files.
let app: Express;
const savedEnv = process.env.NODE_ENV;

beforeAll(async () => {
  process.env.NODE_ENV = 'production';
  resetConfigCache();
  app = (await import('../../server/app')).createApp();
});
afterAll(async () => {
  process.env.NODE_ENV = savedEnv;
  resetConfigCache();
  await closeSequelize();
});

describe('NODE_ENV=production', () => {
  it('when an admin asks for the outbox, then 404 (the route does not exist in production)', async () => {
    const { agent } = await signedInAs(app, ['admin']);
    const res = await agent.get('/api/outbox');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('when health is asked, then outbox is false', async () => {
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.outbox).toBe(false);
  });
});
