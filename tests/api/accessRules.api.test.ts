import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import type { PublicUser } from '../../server/services/users.service';
import { createDesign, signedInAs, type Agent } from '../helpers/factories';
import { fillPath, routeLabel, walkRoutes } from '../helpers/routeTable';

/** Access rules that had gaps (issue 12, item 8), checked against every route of the real router. */
const app = createApp();
afterAll(() => closeSequelize());

/** Routes any signed-in account may use: its own profile and sessions (and the public ones). */
const PROFILE_ROUTES = new Set([
  'GET /api/auth/me',
  'GET /api/auth/sessions',
  'DELETE /api/auth/sessions',
  'DELETE /api/auth/sessions/:id',
]);
const ROUTES = walkRoutes();

describe('an account without a role', () => {
  let noRole: Agent;
  beforeAll(async () => {
    ({ agent: noRole } = await signedInAs(app, []));
  });

  it('when the router is walked, then it finds the routes (so the checks below cover something)', () => {
    expect(ROUTES.length).toBeGreaterThan(60);
    expect(ROUTES.map(routeLabel)).toEqual(expect.arrayContaining(['GET /api/designs/:id', 'POST /api/calc', 'GET /api/parts/belts']));
  });

  // fix: #12 — an invited account without a role could read designs, attachments and parts and use /api/calc.
  it.each(ROUTES.filter((r) => r.isSignedIn && !PROFILE_ROUTES.has(routeLabel(r))).map((r) => [routeLabel(r), r] as const))(
    'when it calls %s, then 403 and nothing of the team is shown',
    async (_label, route) => {
      // Act
      const res = await noRole[route.method](fillPath(route.path, 1)).send(route.method === 'get' ? undefined : {});
      // Assert
      expect(res.status, JSON.stringify(res.body)).toBe(403);
      expect(res.body).toEqual({ error: { code: 'forbidden', message: expect.any(String) } });
    },
  );

  it('when it reads its own profile and sessions, then it may', async () => {
    expect((await noRole.get('/api/auth/me')).status).toBe(200);
    expect((await noRole.get('/api/auth/sessions')).status).toBe(200);
  });

  it('when a route is neither public nor the profile, then it checks a role (no route relies on sign-in alone)', () => {
    const signedInOnly = ROUTES.filter((r) => r.isSignedIn && r.roles === null && !PROFILE_ROUTES.has(routeLabel(r)));
    expect(signedInOnly.map(routeLabel)).toEqual([]);
  });
});

describe('a design in review follows the revision read rule', () => {
  type Who = 'owner' | 'otherDesigner' | 'maker' | 'reviewer' | 'admin';
  const agents = {} as Record<Who, Agent>;
  const users = {} as Record<Who, PublicUser>;
  let designId: number;

  beforeAll(async () => {
    const roles: Record<Who, ('designer' | 'maker' | 'reviewer' | 'admin')[]> = {
      owner: ['designer'],
      otherDesigner: ['designer'],
      maker: ['maker'],
      reviewer: ['reviewer'],
      admin: ['admin'],
    };
    for (const who of Object.keys(roles) as Who[]) ({ agent: agents[who], user: users[who] } = await signedInAs(app, roles[who]));
    designId = (await createDesign({ owner: users.owner })).id;
    expect((await agents.owner.post(`/api/designs/${designId}/submit`).send({})).status).toBe(201);
  });

  // fix: #12 — GET /api/designs/:id and /export handed the inputs of a revision in review to anyone signed in.
  it.each([
    ['maker', 403],
    ['otherDesigner', 403],
    ['reviewer', 200],
    ['owner', 200],
    ['admin', 200],
  ] as const)('when %s reads, exports or copies it, then %i', async (who, expected) => {
    // Act
    const read = await agents[who].get(`/api/designs/${designId}`);
    const exported = await agents[who].get(`/api/designs/${designId}/export`);
    const copied = await agents[who].post('/api/designs').send({ copyOf: designId });
    // Assert
    expect(read.status).toBe(expected);
    expect(exported.status).toBe(expected);
    if (expected === 403) {
      expect(read.body.error.code).toBe('forbidden');
      expect(JSON.stringify(exported.body)).not.toContain('"inputs"');
      // A maker may not create designs at all; another designer may, but not from a design it may not read.
      expect(copied.status).toBe(403);
    } else {
      expect(read.body.inputs.mechanism).toBeTruthy();
    }
  });

  it('when the revision is approved, then everyone with a role reads the design again', async () => {
    // Arrange
    const revisions = await agents.owner.get(`/api/designs/${designId}/revisions`);
    const revisionId = revisions.body.items[0].id as number;
    expect((await agents.reviewer.post(`/api/revisions/${revisionId}/approve`).send({ comment: 'fine' })).status).toBe(200);
    // Act
    const asMaker = await agents.maker.get(`/api/designs/${designId}`);
    const asDesigner = await agents.otherDesigner.get(`/api/designs/${designId}/export`);
    // Assert
    expect(asMaker.status).toBe(200);
    expect(asDesigner.status).toBe(200);
  }, 60_000);
});

describe('anonymous', () => {
  it.each(ROUTES.filter((r) => r.isSignedIn).map((r) => [routeLabel(r), r] as const))(
    'when nobody is signed in, %s answers 401',
    async (_l, route) => {
      const res = await request(app)[route.method](fillPath(route.path, 1));
      expect(res.status).toBe(401);
    },
  );
});
