import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { Design, Measurement, Revision } from '../../server/models';
import type { PublicUser } from '../../server/services/users.service';
import { createApprovedSheet, createDesign, signedInAs, type Agent } from '../helpers/factories';
import { fillPath, routeLabel, walkRoutes } from '../helpers/routeTable';

/**
 * Requests another site starts are refused before they change anything (CSRF; issue 12, item 3). Before, the
 * session cookie's SameSite=Lax was the only guard, and empty or multipart POSTs with a foreign Origin submitted,
 * withdrew, approved, reopened and recorded measurements.
 */
const app = createApp();
const FOREIGN = 'https://attacker.example';
const STATE_CHANGING = walkRoutes().filter((r) => r.method !== 'get');

let admin: Agent;
let designer: { agent: Agent; user: PublicUser };
let reviewer: { agent: Agent; user: PublicUser };
let maker: Agent;

beforeAll(async () => {
  ({ agent: admin } = await signedInAs(app, ['admin']));
  designer = await signedInAs(app, ['designer']);
  reviewer = await signedInAs(app, ['reviewer']);
  ({ agent: maker } = await signedInAs(app, ['maker']));
});
afterAll(() => closeSequelize());

const expectRefused = (res: { status: number; body: { error?: { code?: string; message?: string } } }) => {
  expect(res.status).toBe(403);
  expect(res.body.error?.code).toBe('cross_site_request');
  expect(res.body.error?.message).toMatch(/another site/);
};

describe('every state-changing route', () => {
  it('when the router is walked, then it finds the state-changing routes', () => {
    expect(STATE_CHANGING.map(routeLabel)).toEqual(
      expect.arrayContaining(['POST /api/designs/:id/submit', 'POST /api/revisions/:id/approve', 'POST /api/sheets/:id/measurements']),
    );
  });

  it.each(STATE_CHANGING.map((r) => [routeLabel(r), r] as const))('when %s comes with a foreign Origin, then 403', async (_l, route) => {
    const res = await admin[route.method](fillPath(route.path, 1)).set('Origin', FOREIGN).send({});
    expectRefused(res);
  });

  it.each(STATE_CHANGING.map((r) => [routeLabel(r), r] as const))(
    'when %s says Sec-Fetch-Site: cross-site, then 403',
    async (_l, route) => {
      const res = await admin[route.method](fillPath(route.path, 1)).set('Sec-Fetch-Site', 'cross-site');
      expectRefused(res);
    },
  );
});

describe('the transitions the probe carried out', () => {
  // fix: #12 — these went through with a foreign Origin.
  it('when submit, withdraw, approve and reopen come from another site (empty body, no content type), then nothing changes', async () => {
    // Arrange
    const draft = await createDesign({ owner: designer.user });
    const inReview = await createDesign({ owner: designer.user });
    const submitted = await designer.agent.post(`/api/designs/${inReview.id}/submit`).send({});
    const approved = await createApprovedSheet({ owner: designer.user, approver: reviewer.user });
    // Act
    const submit = await designer.agent.post(`/api/designs/${draft.id}/submit`).set('Origin', FOREIGN);
    const withdraw = await designer.agent.post(`/api/designs/${inReview.id}/withdraw`).set('Origin', FOREIGN);
    const approve = await reviewer.agent.post(`/api/revisions/${submitted.body.id}/approve`).set('Origin', FOREIGN);
    const reopen = await designer.agent.post(`/api/designs/${approved.designId}/reopen`).set('Sec-Fetch-Site', 'cross-site');
    // Assert
    for (const res of [submit, withdraw, approve, reopen]) expectRefused(res);
    expect((await Design.findByPk(draft.id))!.status).toBe('draft');
    expect((await Design.findByPk(inReview.id))!.status).toBe('in_review');
    expect((await Revision.findByPk(submitted.body.id))!.status).toBe('in_review');
    expect((await Design.findByPk(approved.designId))!.status).toBe('approved');
  });

  it('when a measurement is posted as a multipart form from another site, then it is refused unread and nothing is stored', async () => {
    // Arrange
    const { sheetId, result } = await createApprovedSheet({ owner: designer.user, approver: reviewer.user });
    const spanId = result.belts[0].spans[0].id;
    // Act
    const res = await maker
      .post(`/api/sheets/${sheetId}/measurements`)
      .set('Origin', FOREIGN)
      .field('spanId', spanId)
      .field('frequencyHz', '100');
    // Assert
    expectRefused(res);
    expect(await Measurement.count({ where: { sheetId } })).toBe(0);
  });
});

describe('requests from the app itself', () => {
  it.each([
    ['Origin is APP_URL', { Origin: new URL(getConfig().appUrl).origin }],
    ['Sec-Fetch-Site is same-origin', { 'Sec-Fetch-Site': 'same-origin', Origin: FOREIGN }],
    ['neither header is sent (not a browser page)', {}],
  ])('when %s, then the request goes through', async (_l, headers) => {
    // Arrange
    const draft = await createDesign({ owner: designer.user });
    // Act
    const res = await designer.agent.post(`/api/designs/${draft.id}/submit`).set(headers).send({});
    // Assert
    expect(res.status).toBe(201);
  });

  it('when Origin is the address the request was sent to (its scheme and Host), then it goes through', async () => {
    // Arrange
    const draft = await createDesign({ owner: designer.user });
    // Act
    const res = await designer.agent
      .post(`/api/designs/${draft.id}/submit`)
      .set('Host', 'gw.example.test:8080')
      .set('Origin', 'http://gw.example.test:8080')
      .send({});
    // Assert
    expect(res.status).toBe(201);
  });

  it.each([
    ['Origin: null', { Origin: 'null' }],
    ['Sec-Fetch-Site: same-site (a sibling subdomain)', { 'Sec-Fetch-Site': 'same-site' }],
    ['an Origin on another port', { Origin: `${new URL(getConfig().appUrl).protocol}//${new URL(getConfig().appUrl).hostname}:1` }],
  ])('when %s, then it is refused', async (_l, headers) => {
    const res = await admin.post('/api/auth/logout').set(headers);
    expectRefused(res);
  });

  it('when a sign-in is posted from another site (login CSRF), then it is refused', async () => {
    const res = await admin.post('/api/auth/login').set('Origin', FOREIGN).send({ email: 'x@example.test', password: 'whatever-password' });
    expectRefused(res);
  });

  it('when a GET comes from another site, then it is answered (reads change nothing; the cookie is SameSite=Strict)', async () => {
    const res = await admin.get('/api/auth/me').set('Origin', FOREIGN).set('Sec-Fetch-Site', 'cross-site');
    expect(res.status).toBe(200);
  });
});
