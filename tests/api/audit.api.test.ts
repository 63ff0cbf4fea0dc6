import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import type { PublicUser } from '../../server/services/users.service';
import { createUser, signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
let admin: Agent;
let adminUser: PublicUser;

beforeAll(async () => {
  ({ agent: admin, user: adminUser } = await signedInAs(app, ['admin']));
});
afterAll(() => closeSequelize());

describe('GET /api/audit', () => {
  it('when an admin disables a user and changes roles, then both appear newest first with actor, from and to', async () => {
    const { user } = await createUser({ roles: ['maker'] });
    await admin.patch(`/api/users/${user.id}`).send({ disabled: true });
    await admin.patch(`/api/users/${user.id}`).send({ roles: ['maker', 'reviewer'] });

    const res = await admin.get(`/api/audit?entity=user&entityId=${user.id}`);

    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect(res.body.items).toEqual([
      {
        id: expect.any(Number),
        actor: { id: adminUser.id, name: adminUser.name, email: adminUser.email },
        action: 'user.roles',
        entity: 'user',
        entityId: user.id,
        from: 'maker',
        to: 'reviewer,maker',
        reason: null,
        at: expect.any(String),
      },
      {
        id: expect.any(Number),
        actor: { id: adminUser.id, name: adminUser.name, email: adminUser.email },
        action: 'user.disable',
        entity: 'user',
        entityId: user.id,
        from: 'active',
        to: 'disabled',
        reason: null,
        at: expect.any(String),
      },
    ]);
  });

  it('when an admin invites a user, then an invite entry is recorded', async () => {
    const res = await admin.post('/api/users').send({ email: `audit-${Date.now()}@example.test`, name: 'Audit Invitee', roles: [] });
    const log = await admin.get(`/api/audit?entity=user&entityId=${res.body.user.id}`);
    expect(log.body.items.map((e: { action: string }) => e.action)).toEqual(['user.invite']);
  });

  it('when pageSize is not a number, then 400 with path pageSize', async () => {
    const res = await admin.get('/api/audit?pageSize=lots');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'pageSize', message: 'must be a number' }]);
  });
});
