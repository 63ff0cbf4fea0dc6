import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize, getSequelize } from '../../server/db';
import { MALFORMED_TEXT_MESSAGE } from '../../server/middleware/validate';
import { Design } from '../../server/models';
import { createApprovedSheet, createDesign, createPart, signedInAs, type Agent } from '../helpers/factories';
import { fillPath, routeLabel, walkRoutes, type ApiRoute } from '../helpers/routeTable';

/** The 500s the probe still found (issue 12, item 9), checked on every route of the real router that can have them. */
const app = createApp();
const ROUTES = walkRoutes();
let admin: Agent;
let adminId: number;
/** Real targets, so each route gets past its own look-ups to the part under test. */
const ids: Record<string, number> = {};

beforeAll(async () => {
  const signed = await signedInAs(app, ['admin']);
  admin = signed.agent;
  adminId = signed.user.id;
  const designer = await signedInAs(app, ['designer']);
  ids.design = (await createDesign({ owner: signed.user })).id;
  ids.motor = (await createPart('motor')).id;
  ids.sheet = (await createApprovedSheet({ owner: designer.user, approver: signed.user })).sheetId;
});
afterAll(() => closeSequelize());

/** A path whose ids name real rows where the route looks them up before reading the body. */
function realPath(route: ApiRoute): string {
  const id = route.path.startsWith('/api/sheets')
    ? ids.sheet
    : route.path.startsWith('/api/parts/motors')
      ? ids.motor
      : route.path.startsWith('/api/designs')
        ? ids.design
        : 1;
  return fillPath(route.path, id, { measurementId: 1 });
}

describe('malformed multipart on every upload route', () => {
  const uploads = ROUTES.filter((r) => r.isUpload);

  it('when the router is walked, then it finds the four upload routes', () => {
    expect(uploads.map(routeLabel).sort()).toEqual([
      'POST /api/designs/:id/attachments',
      'POST /api/designs/:id/job',
      'POST /api/parts/motors/:id/torque-curve',
      'POST /api/sheets/:id/measurements',
    ]);
  });

  // fix: #12 — a multipart Content-Type without a boundary, or a form cut short, answered 500.
  it.each(uploads.map((r) => [routeLabel(r), r] as const))(
    'when %s gets multipart without a boundary, then 400 invalid_upload',
    async (_l, route) => {
      const res = await admin.post(realPath(route)).set('Content-Type', 'multipart/form-data').send('--x\r\ncontent\r\n');
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_upload');
    },
  );

  it.each(uploads.map((r) => [routeLabel(r), r] as const))('when %s gets a truncated form, then 400 invalid_upload', async (_l, route) => {
    const cut =
      '--b0undary\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\nrpm,torque\r\n100,0.4';
    const res = await admin.post(realPath(route)).set('Content-Type', 'multipart/form-data; boundary=b0undary').send(cut);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_upload');
  });

  it.each(uploads.map((r) => [routeLabel(r), r] as const))('when %s gets a broken part header, then 400', async (_l, route) => {
    const broken = '--b0undary\r\nContent-Disposition form-data name\r\n\r\nx\r\n--b0undary--\r\n';
    const res = await admin.post(realPath(route)).set('Content-Type', 'multipart/form-data; boundary=b0undary').send(broken);
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
  });
});

describe('a lone surrogate in any text field', () => {
  const withBody = ROUTES.filter((r) => r.schemas.body && !(r.method === 'post' && r.path === '/api/auth/logout'));

  // fix: #12 — "\ud800" reached MariaDB, which cannot store it, and the answer was 500.
  it.each(withBody.map((r) => [routeLabel(r), r] as const))('when %s gets one, then 400 naming the field', async (_l, route) => {
    // Act
    const res = await admin[route.method](realPath(route)).send({ note: 'fine', name: 'Gantry \ud800 stage' });
    // Assert
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toContainEqual({ path: 'name', message: MALFORMED_TEXT_MESSAGE });
  });

  it('when it sits deep in a design document or in a key, then the path names where', async () => {
    // Arrange
    const doc = (await admin.get(`/api/designs/${ids.design}/export`)).body;
    // Act
    const nested = await admin
      .patch(`/api/designs/${ids.design}`)
      .send({ version: 1, inputs: { ...doc, belt: { ...doc.belt, label: '\udfff' } } });
    const key = await admin.post('/api/calc').send({ design: { ...doc, ['x\ud800']: 1 } });
    // Assert
    expect(nested.status).toBe(400);
    expect(nested.body.error.details).toContainEqual({ path: 'inputs.belt.label', message: MALFORMED_TEXT_MESSAGE });
    expect(key.status).toBe(400);
    expect(key.body.error.details).toContainEqual({ path: 'design.x\ufffd', message: MALFORMED_TEXT_MESSAGE });
    expect((await Design.findByPk(ids.design))!.version).toBe(1);
  });

  it('when the pair is complete (an emoji), then the text is fine', async () => {
    const res = await admin.patch(`/api/designs/${ids.design}`).send({ version: 1, name: 'Gantry 🛠 stage' });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Gantry 🛠 stage');
    await admin.patch(`/api/designs/${ids.design}`).send({ version: 2, name: 'Gantry stage' });
  });
});

describe('other malformed requests', () => {
  // fix: #12 — a path segment whose percent-encoding is broken answered 500.
  it.each(['/api/designs/%E0%A4%A', '/api/users/%', '/api/sheets/%C0%AF/pdf'])('when the path is %s, then 400', async (path) => {
    const res = await admin.get(path);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toMatch(/bad_request|validation_failed/);
  });
});

describe('a query cut by a lost connection', () => {
  // fix: #12 — a query whose connection was killed answered 500; like other connection errors it is a 503.
  // A connection lost before COMMIT runs the whole transaction again (server/db.ts, up to DB_RETRY_ATTEMPTS): so the
  // connection is killed on every attempt, and only when none is left does the answer come.
  it('when the connection running a request’s query is killed, then the answer is 503 db_unavailable and the next request works', async () => {
    // Arrange: hold the design's row, so the request's UPDATE waits on it where we can find and kill it.
    const sequelize = getSequelize();
    const design = await createDesign({ owner: { id: adminId } as never });
    const holder = await sequelize.transaction();
    await sequelize.query('SELECT id FROM designs WHERE id = ? FOR UPDATE', { replacements: [design.id], transaction: holder });
    /** The connection whose UPDATE of the design waits on the row now (not one already killed), or undefined. */
    const waitingUpdate = async (killed: number[]): Promise<number | undefined> => {
      const rows = await sequelize.query<{ ID: number }>(
        "SELECT ID FROM information_schema.PROCESSLIST WHERE INFO LIKE 'UPDATE `designs`%' AND INFO LIKE ? AND ID <> CONNECTION_ID()" +
          (killed.length ? ` AND ID NOT IN (${killed.map(Number).join(', ')})` : ''),
        { replacements: [`%\`id\` = ${design.id}%`], type: QueryTypes.SELECT, transaction: holder },
      );
      return rows[0]?.ID;
    };
    // Act
    let answered = false;
    const pending = admin
      .patch(`/api/designs/${design.id}`)
      .send({ name: 'renamed while blocked', version: 1 })
      .then((r) => {
        answered = true;
        return r;
      });
    const killed: number[] = [];
    for (let i = 0; i < 400 && !answered; i += 1) {
      const threadId = await waitingUpdate(killed);
      if (threadId === undefined) await new Promise((resolve) => setTimeout(resolve, 50));
      else {
        await sequelize.query(`KILL CONNECTION ${Number(threadId)}`, { transaction: holder });
        killed.push(threadId);
      }
    }
    const res = await pending;
    await holder.rollback();
    // Assert
    expect(killed).toHaveLength(getConfig().db.retryAttempts ?? 6);
    expect(res.status).toBe(503);
    expect(res.body.error).toEqual({ code: 'db_unavailable', message: 'The database is not reachable. Try again shortly.' });
    expect((await admin.get(`/api/designs/${design.id}`)).body.version).toBe(1);
  });
});
