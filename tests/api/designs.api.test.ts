import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultDesign, evaluateDesign, type DesignInput } from '@/engine';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { AuditLog, Design, type DesignStatus, type Role } from '../../server/models';
import type { PublicUser } from '../../server/services/users.service';
import { createDesign, signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
afterAll(() => closeSequelize());

type Who = 'owner' | 'otherDesigner' | 'admin' | 'reviewer' | 'maker' | 'anonymous';
const agents = {} as Record<Who, Agent>;
const users = {} as Record<Exclude<Who, 'anonymous'>, PublicUser>;

beforeAll(async () => {
  const roles: Record<Exclude<Who, 'anonymous'>, Role[]> = {
    owner: ['designer'],
    otherDesigner: ['designer'],
    admin: ['admin'],
    reviewer: ['reviewer'],
    maker: ['maker'],
  };
  for (const who of Object.keys(roles) as Array<Exclude<Who, 'anonymous'>>) {
    const signed = await signedInAs(app, roles[who]);
    agents[who] = signed.agent;
    users[who] = signed.user;
  }
  agents.anonymous = request.agent(app);
});

/** A tag unique to one test, put into design names so searches see only that test's rows. */
const uniqueTag = () => `t${randomBytes(5).toString('hex')}`;

/** A valid design document with a name. */
function documentNamed(name: string, mechanism: DesignInput['mechanism'] = 'corexy'): DesignInput {
  return { ...defaultDesign(mechanism), name };
}

/** Reads a design's row straight from the database (state after a request). */
async function storedDesign(id: number): Promise<Record<string, unknown> | null> {
  const row = await Design.findByPk(id);
  return row ? row.get({ plain: true }) : null;
}

describe('role matrix for /api/designs', () => {
  type RouteCase = { name: string; call: (agent: Agent, designId: number) => Promise<request.Response>; expected: Record<Who, number> };
  const READ = { owner: 200, otherDesigner: 200, admin: 200, reviewer: 200, maker: 200, anonymous: 401 };
  const ROUTES: RouteCase[] = [
    { name: 'GET /api/designs', call: (a) => a.get('/api/designs'), expected: READ },
    { name: 'GET /api/designs/:id', call: (a, id) => a.get(`/api/designs/${id}`), expected: READ },
    { name: 'GET /api/designs/:id/export', call: (a, id) => a.get(`/api/designs/${id}/export`), expected: READ },
    {
      name: 'POST /api/designs (template)',
      call: (a) => a.post('/api/designs').send({ template: 'corexy', name: `Role check ${uniqueTag()}` }),
      expected: { owner: 201, otherDesigner: 201, admin: 201, reviewer: 403, maker: 403, anonymous: 401 },
    },
    {
      name: 'POST /api/designs (copy)',
      call: (a, id) => a.post('/api/designs').send({ copyOf: id }),
      expected: { owner: 201, otherDesigner: 201, admin: 201, reviewer: 403, maker: 403, anonymous: 401 },
    },
    {
      name: 'PATCH /api/designs/:id',
      call: (a, id) => a.patch(`/api/designs/${id}`).send({ name: 'Renamed by role check', version: 1 }),
      expected: { owner: 200, otherDesigner: 403, admin: 200, reviewer: 403, maker: 403, anonymous: 401 },
    },
    {
      name: 'DELETE /api/designs/:id',
      call: (a, id) => a.delete(`/api/designs/${id}`),
      expected: { owner: 204, otherDesigner: 403, admin: 204, reviewer: 403, maker: 403, anonymous: 401 },
    },
  ];
  const cases = ROUTES.flatMap((route) =>
    (Object.keys(route.expected) as Who[]).map((who) => ({ route, who, status: route.expected[who] })),
  );

  it.each(cases)('when $who calls $route.name on a draft of the owner, then $status', async ({ route, who, status }) => {
    const design = await createDesign({ owner: users.owner });

    const res = await route.call(agents[who], design.id);

    expect(res.status).toBe(status);
    if (status === 401) expect(res.body.error.code).toBe('unauthenticated');
    if (status === 403) expect(res.body.error.code).toBe('forbidden');
  });

  it('when another designer or a reviewer tries to change a draft, then the stored design is unchanged', async () => {
    const design = await createDesign({ owner: users.owner, name: 'Untouchable draft' });

    await agents.otherDesigner.patch(`/api/designs/${design.id}`).send({ name: 'Hijacked', version: 1 });
    await agents.reviewer.patch(`/api/designs/${design.id}`).send({ name: 'Hijacked', version: 1 });
    await agents.otherDesigner.delete(`/api/designs/${design.id}`);
    const after = await agents.owner.get(`/api/designs/${design.id}`);

    expect(after.status).toBe(200);
    expect(after.body).toMatchObject({ name: 'Untouchable draft', version: 1 });
  });
});

describe('GET /api/designs/:id editable (the server says whether the asker may edit, and why not)', () => {
  it.each([
    { who: 'owner', status: 'draft', editable: { ok: true, reason: null } },
    { who: 'owner', status: 'returned', editable: { ok: true, reason: null } },
    { who: 'admin', status: 'draft', editable: { ok: true, reason: null } },
    { who: 'otherDesigner', status: 'draft', editable: { ok: false, reason: 'not_owner' } },
    { who: 'reviewer', status: 'draft', editable: { ok: false, reason: 'not_designer' } },
    { who: 'maker', status: 'returned', editable: { ok: false, reason: 'not_designer' } },
    { who: 'owner', status: 'in_review', editable: { ok: false, reason: 'in_review' } },
    { who: 'admin', status: 'in_review', editable: { ok: false, reason: 'in_review' } },
    { who: 'owner', status: 'approved', editable: { ok: false, reason: 'approved_reopenable' } },
    { who: 'admin', status: 'approved', editable: { ok: false, reason: 'approved_reopenable' } },
    { who: 'otherDesigner', status: 'approved', editable: { ok: false, reason: 'approved' } },
  ] as { who: Exclude<Who, 'anonymous'>; status: DesignStatus; editable: { ok: boolean; reason: string | null } }[])(
    'when $who reads a $status design, then editable is $editable.ok ($editable.reason) and canEdit agrees',
    async ({ who, status, editable }) => {
      // Arrange
      const design = await createDesign({ owner: users.owner });
      await Design.update({ status }, { where: { id: design.id } });

      // Act
      const res = await agents[who].get(`/api/designs/${design.id}`);

      // Assert
      expect(res.status).toBe(200);
      expect(res.body.editable).toEqual(editable);
      expect(res.body.canEdit).toBe(editable.ok);
    },
  );

  it('when the owner saves a draft, then the answer still says it is editable', async () => {
    const design = await createDesign({ owner: users.owner });

    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: `Still mine ${uniqueTag()}`, version: 1 });

    expect(res.status).toBe(200);
    expect(res.body.editable).toEqual({ ok: true, reason: null });
  });
});

describe('POST /api/designs', () => {
  it('when a designer posts a document, then 201 with a version-1 draft they own, and GET returns the same inputs', async () => {
    const doc = documentNamed(`Bench dispensing stage ${uniqueTag()}`);
    doc.frame.outerXMm = 520;

    const res = await agents.owner.post('/api/designs').send(doc);
    const got = await agents.maker.get(`/api/designs/${res.body.id}`);

    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      name: doc.name,
      mechanism: 'corexy',
      status: 'draft',
      version: 1,
      owner: { id: users.owner.id, name: users.owner.name },
      inputs: doc,
      canEdit: true,
      canDelete: true,
    });
    expect(got.status).toBe(200);
    expect(got.body.inputs).toEqual(doc);
    expect(got.body).toMatchObject({ canEdit: false, canDelete: false });
  });

  it('when saved, then the stored travel and summary are the engine result for those inputs', async () => {
    const doc = documentNamed(`Travel check ${uniqueTag()}`, 'hbot');
    doc.frame.outerXMm = 600;
    doc.frame.outerYMm = 380;
    const expected = evaluateDesign(doc);

    const res = await agents.owner.post('/api/designs').send(doc);

    expect(res.status).toBe(201);
    expect(res.body.travel.xMm).toBeCloseTo(expected.travel.xMm, 9);
    expect(res.body.travel.yMm).toBeCloseTo(expected.travel.yMm, 9);
    // A wider than deep frame must give more X than Y travel: the numbers are not swapped or constant.
    expect(res.body.travel.xMm).toBeGreaterThan(res.body.travel.yMm);
    expect(res.body.latestResultSummary).toMatchObject({
      engineVersion: expected.engineVersion,
      stepsPerMm: expected.drive.stepsPerMm,
      lowestFrequencyHz: expected.stiffness.min.frequencyHz,
      checks: { total: expected.checks.length },
    });
  });

  it('when a document leaves out optional fields, then the stored inputs have the defaults filled in', async () => {
    const { frictionN: _f, map: _m, toolMount: _t, ringingToleranceMm: _r, ...partial } = documentNamed(`Defaults ${uniqueTag()}`);

    const res = await agents.owner.post('/api/designs').send(partial);

    expect(res.status).toBe(201);
    expect(res.body.inputs).toMatchObject({ frictionN: { x: 0, y: 0 }, map: { points: 41 }, toolMount: null, ringingToleranceMm: 0.02 });
  });

  it.each(['corexy', 'hbot', 'cartesian'] as const)(
    'when created from the %s template with a name, then the inputs are the template under that name',
    async (mechanism) => {
      const name = `From template ${uniqueTag()}`;

      const res = await agents.owner.post('/api/designs').send({ template: mechanism, name });

      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({ name, mechanism, status: 'draft', version: 1 });
      expect(res.body.inputs).toEqual({ ...defaultDesign(mechanism), name });
    },
  );

  it('when created from a template without a name, then the template name is used', async () => {
    const res = await agents.owner.post('/api/designs').send({ template: 'hbot' });
    expect(res.status).toBe(201);
    expect(res.body.name).toBe(defaultDesign('hbot').name);
  });

  it('when another designer copies a design, then the copy is their version-1 draft and the source is untouched', async () => {
    const source = await createDesign({ owner: users.owner, name: `Pen plotter ${uniqueTag()}`, mechanism: 'hbot', status: 'approved' });

    const res = await agents.otherDesigner.post('/api/designs').send({ copyOf: source.id });
    const sourceAfter = await storedDesign(source.id);

    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      name: `Copy of ${source.name}`,
      mechanism: 'hbot',
      status: 'draft',
      version: 1,
      owner: { id: users.otherDesigner.id },
    });
    expect(res.body.id).not.toBe(source.id);
    expect(res.body.inputs).toEqual({ ...source.inputs, name: `Copy of ${source.name}` });
    expect(sourceAfter).toMatchObject({ status: 'approved', ownerId: users.owner.id, version: 1, name: source.name });
  });

  it('when a copy names itself, then it takes that name', async () => {
    const source = await createDesign({ owner: users.owner });
    const res = await agents.owner.post('/api/designs').send({ copyOf: source.id, name: 'Label placer, wide' });
    expect(res.status).toBe(201);
    expect(res.body.name).toBe('Label placer, wide');
    expect(res.body.inputs.name).toBe('Label placer, wide');
  });

  it('when the design to copy does not exist, then 404 naming copyOf', async () => {
    const res = await agents.owner.post('/api/designs').send({ copyOf: 2147483000 });
    expect(res.status).toBe(404);
    expect(res.body.error.details).toEqual([{ path: 'copyOf', message: 'no design with this id' }]);
  });

  it('when a design is created, then the audit log records who created it and how', async () => {
    const res = await agents.owner.post('/api/designs').send({ template: 'cartesian', name: `Audited ${uniqueTag()}` });
    const entries = await AuditLog.findAll({ where: { entity: 'design', entityId: res.body.id } });
    expect(entries.map((e) => ({ action: e.action, actorId: e.actorId, toState: e.toState, reason: e.reason }))).toEqual([
      { action: 'design.create', actorId: users.owner.id, toState: 'draft', reason: 'template cartesian' },
    ]);
  });
});

describe('POST /api/designs validation', () => {
  it('when the document has an unknown field, then 400 names its path and nothing is stored', async () => {
    const tag = uniqueTag();
    const doc = documentNamed(`Unknown field ${tag}`) as unknown as Record<string, Record<string, unknown>>;
    doc.frame = { ...doc.frame, colour: 'red' };

    const res = await agents.owner.post('/api/designs').send(doc);
    const listed = await agents.owner.get(`/api/designs?q=${tag}`);

    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toEqual([{ path: 'frame.colour', message: 'unknown field "colour"' }]);
    expect(listed.body.total).toBe(0);
  });

  it("when microsteps is 3, then 400 at driver.microsteps with the form's message", async () => {
    const doc = documentNamed('Bad microsteps');
    doc.driver.microsteps = 3;

    const res = await agents.owner.post('/api/designs').send(doc);

    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'driver.microsteps', message: 'microsteps must be a power of two from 1 to 256 (1, 2, 4, 8, 16, 32, 64, 128, 256)' },
    ]);
  });

  it('when several fields are wrong, then each is named', async () => {
    const doc = documentNamed('Many problems') as unknown as Record<string, unknown>;
    (doc.belt as Record<string, unknown>).pitchMm = -2;
    (doc.masses as Record<string, unknown>).carriageKg = 'heavy';
    delete doc.motor;

    const res = await agents.owner.post('/api/designs').send(doc);

    expect(res.status).toBe(400);
    const paths = (res.body.error.details as Array<{ path: string }>).map((d) => d.path).sort();
    expect(paths).toEqual(['belt.pitchMm', 'masses.carriageKg', 'motor']);
    expect(res.body.error.details).toContainEqual({ path: 'motor', message: 'is required' });
  });

  it.each([
    { body: { template: 'delta' }, path: 'template' },
    { body: { template: 'corexy', name: '   ' }, path: 'name' },
    { body: { template: 'corexy', colour: 'red' }, path: 'colour' },
    { body: { copyOf: 'first' }, path: 'copyOf' },
    { body: { copyOf: 1, frame: {} }, path: 'frame' },
    { body: [1, 2], path: 'body' },
  ])('when the body is $body, then 400 names $path', async ({ body, path }) => {
    const res = await agents.owner.post('/api/designs').send(body);
    expect(res.status).toBe(400);
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual([path]);
  });
});

describe('GET /api/designs/:id', () => {
  it('when the design exists, then every reader gets inputs, owner, version, summary and who saved last', async () => {
    const design = await createDesign({ owner: users.owner, mechanism: 'cartesian' });

    const res = await agents.reviewer.get(`/api/designs/${design.id}`);

    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      id: design.id,
      name: design.name,
      mechanism: 'cartesian',
      status: 'draft',
      owner: { id: users.owner.id, name: users.owner.name },
      travel: { xMm: expect.any(Number), yMm: expect.any(Number) },
      version: 1,
      updatedAt: expect.any(String),
      createdAt: expect.any(String),
      canOpen: true,
      canEdit: false,
      canDelete: false,
      inputs: design.inputs,
      editable: { ok: false, reason: 'not_designer' },
      updatedBy: { id: users.owner.id, name: users.owner.name },
      latestResultSummary: expect.objectContaining({ engineVersion: expect.any(String) }),
    });
  });

  it.each([
    { id: '2147483000', status: 404, code: 'not_found' },
    { id: 'abc', status: 400, code: 'validation_failed' },
    { id: '1.5', status: 400, code: 'validation_failed' },
  ])('when the id is $id, then $status', async ({ id, status, code }) => {
    const res = await agents.owner.get(`/api/designs/${id}`);
    expect(res.status).toBe(status);
    expect(res.body.error.code).toBe(code);
  });
});

describe('PATCH /api/designs/:id', () => {
  it('when the owner saves new inputs with the current version, then 200 with version 2 and GET shows the change', async () => {
    const design = await createDesign({ owner: users.owner });
    const inputs = { ...design.inputs, frame: { ...design.inputs.frame, outerXMm: 700 } };

    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ inputs, version: 1 });
    const got = await agents.owner.get(`/api/designs/${design.id}`);

    expect(res.status).toBe(200);
    expect(res.body.version).toBe(2);
    expect(got.body.version).toBe(2);
    expect(got.body.inputs.frame.outerXMm).toBe(700);
    expect(got.body.travel.xMm).toBeCloseTo(evaluateDesign(inputs).travel.xMm, 9);
    // Travel follows the frame one-for-one (engine frame.ts): 240 mm more frame, 240 mm more travel.
    expect(got.body.travel.xMm - evaluateDesign(design.inputs).travel.xMm).toBeCloseTo(240, 6);
  });

  it('when only the name changes, then the document name follows and the version still moves on', async () => {
    const design = await createDesign({ owner: users.owner });

    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: '  Label placer  ', version: 1 });
    const got = await agents.owner.get(`/api/designs/${design.id}`);

    expect(res.status).toBe(200);
    expect(got.body).toMatchObject({ name: 'Label placer', version: 2, inputs: { name: 'Label placer' } });
    expect(got.body.inputs.frame).toEqual(design.inputs.frame);
  });

  it('when inputs change the mechanism, then the mechanism column follows', async () => {
    const design = await createDesign({ owner: users.owner, mechanism: 'corexy' });
    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ inputs: { ...design.inputs, mechanism: 'hbot' }, version: 1 });
    expect(res.status).toBe(200);
    expect((await storedDesign(design.id))?.mechanism).toBe('hbot');
  });

  it("when an admin edits another user's draft, then it saves and records the admin as last editor", async () => {
    const design = await createDesign({ owner: users.owner });

    const res = await agents.admin.patch(`/api/designs/${design.id}`).send({ name: 'Fixed by admin', version: 1 });

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ name: 'Fixed by admin', owner: { id: users.owner.id }, updatedBy: { id: users.admin.id } });
  });

  it('when two saves use the same version, then the second gets 409 version_conflict naming who saved, and the first survives', async () => {
    const design = await createDesign({ owner: users.owner });
    const first = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'First save', version: 1 });

    const second = await agents.admin.patch(`/api/designs/${design.id}`).send({ name: 'Second save', version: 1 });
    const got = await agents.owner.get(`/api/designs/${design.id}`);

    expect(first.status).toBe(200);
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('version_conflict');
    expect(second.body.error.details).toEqual({
      currentVersion: 2,
      updatedBy: { id: users.owner.id, name: users.owner.name },
      updatedAt: got.body.updatedAt,
    });
    expect(got.body).toMatchObject({ name: 'First save', version: 2 });
  });

  it('when saves race with the same version, then exactly one wins', async () => {
    const design = await createDesign({ owner: users.owner });

    const results = await Promise.all(
      [1, 2, 3, 4].map((n) => agents.owner.patch(`/api/designs/${design.id}`).send({ name: `Racer ${n}`, version: 1 })),
    );
    const got = await agents.owner.get(`/api/designs/${design.id}`);

    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 409, 409, 409]);
    const winner = results.find((r) => r.status === 200)!;
    expect(got.body).toMatchObject({ version: 2, name: winner.body.name });
  });

  it('when the version is ahead of the stored one, then 409 version_conflict too', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'From the future', version: 7 });
    expect(res.status).toBe(409);
    expect(res.body.error.details.currentVersion).toBe(1);
  });

  it.each(['in_review', 'approved'] as DesignStatus[])(
    'when the design is %s, then 409 not_editable and nothing changes',
    async (status) => {
      const design = await createDesign({ owner: users.owner, name: 'Frozen one' });
      await Design.update({ status }, { where: { id: design.id } });

      const byOwner = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'Thawed', version: 1 });
      const byAdmin = await agents.admin.patch(`/api/designs/${design.id}`).send({ name: 'Thawed', version: 1 });
      const got = await agents.owner.get(`/api/designs/${design.id}`);

      expect(byOwner.status).toBe(409);
      expect(byOwner.body.error.code).toBe('not_editable');
      expect(byAdmin.status).toBe(409);
      expect(got.body).toMatchObject({ name: 'Frozen one', version: 1, status, canEdit: false });
    },
  );

  it('when the design was returned, then its owner may edit it again', async () => {
    const design = await createDesign({ owner: users.owner, status: 'returned' });
    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'Reworked after review', version: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ name: 'Reworked after review', version: 2 });
  });

  it('when the inputs are invalid, then 400 names inputs.<field> and the stored design keeps its version', async () => {
    const design = await createDesign({ owner: users.owner });
    const inputs = { ...design.inputs, driver: { ...design.inputs.driver, microsteps: 3 }, belt: { ...design.inputs.belt, widthMm: 0 } };

    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ inputs, version: 1 });

    expect(res.status).toBe(400);
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path).sort()).toEqual([
      'inputs.belt.widthMm',
      'inputs.driver.microsteps',
    ]);
    expect((await storedDesign(design.id))?.version).toBe(1);
  });

  it.each([
    { body: { name: 'No version' }, paths: ['version'] },
    { body: { name: 'Bad version', version: 0 }, paths: ['version'] },
    { body: { version: 1 }, paths: ['body'] },
    { body: { version: 1, status: 'approved' }, paths: ['status'] },
    { body: { version: 1, name: '' }, paths: ['name'] },
  ])('when the body is $body, then 400 names $paths', async ({ body, paths }) => {
    const design = await createDesign({ owner: users.owner });
    const res = await agents.owner.patch(`/api/designs/${design.id}`).send(body);
    expect(res.status).toBe(400);
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual(paths);
  });

  it('when the design does not exist, then 404', async () => {
    const res = await agents.owner.patch('/api/designs/2147483000').send({ name: 'Ghost', version: 1 });
    expect(res.status).toBe(404);
  });
});

describe('DELETE /api/designs/:id', () => {
  it('when the owner deletes a draft, then 204, GET is 404 and the deletion is audited', async () => {
    const design = await createDesign({ owner: users.owner });

    const res = await agents.owner.delete(`/api/designs/${design.id}`);
    const got = await agents.owner.get(`/api/designs/${design.id}`);
    const audit = await AuditLog.findOne({ where: { entity: 'design', entityId: design.id, action: 'design.delete' } });

    expect(res.status).toBe(204);
    expect(got.status).toBe(404);
    expect(audit).toMatchObject({ actorId: users.owner.id, fromState: 'draft' });
  });

  it.each(['in_review', 'approved'] as DesignStatus[])(
    'when the design is %s, then 409 for owner and admin and it stays',
    async (status) => {
      const design = await createDesign({ owner: users.owner, status });

      const byOwner = await agents.owner.delete(`/api/designs/${design.id}`);
      const byAdmin = await agents.admin.delete(`/api/designs/${design.id}`);

      expect(byOwner.status).toBe(409);
      expect(byOwner.body.error.code).toBe('not_deletable');
      expect(byAdmin.status).toBe(409);
      expect(await storedDesign(design.id)).not.toBeNull();
    },
  );

  it('when the design does not exist, then 404', async () => {
    const res = await agents.admin.delete('/api/designs/2147483000');
    expect(res.status).toBe(404);
  });
});

describe('GET /api/designs (list)', () => {
  /** Five designs by two owners, with a shared tag in their names. */
  async function seedFive(tag: string) {
    const rows = [
      await createDesign({ owner: users.owner, name: `${tag} Delta stage`, mechanism: 'corexy' }),
      await createDesign({ owner: users.owner, name: `${tag} alpha plotter`, mechanism: 'hbot', status: 'returned' }),
      await createDesign({ owner: users.otherDesigner, name: `${tag} Charlie placer`, mechanism: 'cartesian', status: 'approved' }),
      await createDesign({ owner: users.otherDesigner, name: `${tag} bravo gantry`, mechanism: 'corexy', status: 'in_review' }),
      await createDesign({ owner: users.owner, name: `${tag} echo bench`, mechanism: 'hbot' }),
    ];
    return rows;
  }
  const names = (res: request.Response) => (res.body.items as Array<{ name: string }>).map((i) => i.name.split(' ')[1]);

  it('when paging through a search, then total counts all matches and each page holds at most pageSize items', async () => {
    const tag = uniqueTag();
    await seedFive(tag);

    const page1 = await agents.reviewer.get(`/api/designs?q=${tag}&pageSize=2&sort=name`);
    const page3 = await agents.reviewer.get(`/api/designs?q=${tag}&pageSize=2&page=3&sort=name`);
    const beyond = await agents.reviewer.get(`/api/designs?q=${tag}&pageSize=2&page=9`);

    expect(page1.status).toBe(200);
    expect(page1.body).toMatchObject({ total: 5, page: 1, pageSize: 2 });
    expect(names(page1)).toEqual(['alpha', 'bravo']);
    expect(names(page3)).toEqual(['echo']);
    expect(beyond.status).toBe(200);
    expect(beyond.body).toEqual({ items: [], total: 5, page: 9, pageSize: 2 });
  });

  it('when listing, then each item has the table fields and no inputs', async () => {
    const tag = uniqueTag();
    const design = await createDesign({ owner: users.owner, name: `${tag} shape check`, mechanism: 'hbot' });

    const res = await agents.maker.get(`/api/designs?q=${tag}`);

    expect(res.body.items).toEqual([
      {
        id: design.id,
        name: design.name,
        mechanism: 'hbot',
        status: 'draft',
        owner: { id: users.owner.id, name: users.owner.name },
        travel: { xMm: expect.any(Number), yMm: expect.any(Number) },
        version: 1,
        updatedAt: expect.any(String),
        createdAt: expect.any(String),
        canOpen: true,
        canEdit: false,
        canDelete: false,
      },
    ]);
    expect(res.body.items[0].travel.xMm).toBeGreaterThan(0);
  });

  it.each([
    { query: 'pageSize=0', path: 'pageSize' },
    { query: 'pageSize=101', path: 'pageSize' },
    { query: 'pageSize=ten', path: 'pageSize' },
    { query: 'page=0', path: 'page' },
    { query: 'page=-1', path: 'page' },
    { query: 'page=1.5', path: 'page' },
    { query: 'sort=colour', path: 'sort' },
    { query: 'sort=--name', path: 'sort' },
    { query: 'status=finished', path: 'status' },
    { query: 'mechanism=delta', path: 'mechanism' },
    { query: 'owner=you', path: 'owner' },
  ])('when the query has $query, then 400 names $path', async ({ query, path }) => {
    const res = await agents.owner.get(`/api/designs?${query}`);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual([path]);
  });

  it('when pageSize is 1 or 100, then it is accepted', async () => {
    const tag = uniqueTag();
    await seedFive(tag);
    const one = await agents.owner.get(`/api/designs?q=${tag}&pageSize=1`);
    const hundred = await agents.owner.get(`/api/designs?q=${tag}&pageSize=100`);
    expect(one.body.items).toHaveLength(1);
    expect(hundred.body.items).toHaveLength(5);
  });

  it.each([
    { sort: 'name', expected: ['alpha', 'bravo', 'Charlie', 'Delta', 'echo'] },
    { sort: '-name', expected: ['echo', 'Delta', 'Charlie', 'bravo', 'alpha'] },
    { sort: 'status', expected: ['Charlie', 'Delta', 'echo', 'bravo', 'alpha'] },
    { sort: 'mechanism', expected: ['Charlie', 'Delta', 'bravo', 'alpha', 'echo'] },
  ])('when sorted by $sort, then the order is $expected', async ({ sort, expected }) => {
    const tag = uniqueTag();
    await seedFive(tag);

    const res = await agents.owner.get(`/api/designs?q=${tag}&sort=${sort}`);

    expect(res.status).toBe(200);
    expect(names(res)).toEqual(expected);
  });

  it('when sorted by owner, then designs group by owner name', async () => {
    const tag = uniqueTag();
    await seedFive(tag);

    const asc = await agents.owner.get(`/api/designs?q=${tag}&sort=owner`);
    const desc = await agents.owner.get(`/api/designs?q=${tag}&sort=-owner`);

    const ownerNames = (res: request.Response) => (res.body.items as Array<{ owner: { name: string } }>).map((i) => i.owner.name);
    const sortedNames = [users.owner.name, users.owner.name, users.owner.name, users.otherDesigner.name, users.otherDesigner.name].sort(
      (a, b) => a.localeCompare(b),
    );
    expect(ownerNames(asc)).toEqual(sortedNames);
    expect(ownerNames(desc)).toEqual([...sortedNames].reverse());
  });

  it('when a design is saved, then it comes first by -updatedAt (the default) and last by updatedAt', async () => {
    const tag = uniqueTag();
    const rows = await seedFive(tag);
    await agents.owner.patch(`/api/designs/${rows[0].id}`).send({ name: `${tag} Delta stage v2`, version: 1 });

    const byDefault = await agents.owner.get(`/api/designs?q=${tag}`);
    const ascending = await agents.owner.get(`/api/designs?q=${tag}&sort=updatedAt`);

    expect(byDefault.body.items[0].id).toBe(rows[0].id);
    expect(ascending.body.items.at(-1).id).toBe(rows[0].id);
  });

  it('when filtering by status, mechanism and owner, then only matching designs are listed', async () => {
    const tag = uniqueTag();
    await seedFive(tag);

    const drafts = await agents.owner.get(`/api/designs?q=${tag}&status=draft&sort=name`);
    const editable = await agents.owner.get(`/api/designs?q=${tag}&status=draft,returned&sort=name`);
    const hbots = await agents.owner.get(`/api/designs?q=${tag}&mechanism=hbot&sort=name`);
    const mine = await agents.otherDesigner.get(`/api/designs?q=${tag}&owner=me&sort=name`);
    const byId = await agents.reviewer.get(`/api/designs?q=${tag}&owner=${users.owner.id}&mechanism=corexy`);

    expect(names(drafts)).toEqual(['Delta', 'echo']);
    expect(names(editable)).toEqual(['alpha', 'Delta', 'echo']);
    expect(names(hbots)).toEqual(['alpha', 'echo']);
    expect(names(mine)).toEqual(['bravo', 'Charlie']);
    expect(names(byId)).toEqual(['Delta']);
    expect(drafts.body.total).toBe(2);
  });

  it('when searching, then the match is case-insensitive on part of the name and LIKE wildcards are literal', async () => {
    const tag = uniqueTag();
    await seedFive(tag);

    const part = await agents.owner.get(`/api/designs?q=${tag}%20CHARLIE`);
    const wildcard = await agents.owner.get(`/api/designs?q=${tag}%25`);

    expect(names(part)).toEqual(['Charlie']);
    expect(wildcard.body.total).toBe(0);
  });

  it('when not signed in, then 401', async () => {
    const res = await request(app).get('/api/designs');
    expect(res.status).toBe(401);
  });
});

describe('GET /api/designs canOpen (a listed design opens for exactly those the read rule lets in)', () => {
  it.each([
    { status: 'draft' as DesignStatus, opens: { owner: true, otherDesigner: true, admin: true, reviewer: true, maker: true } },
    { status: 'in_review' as DesignStatus, opens: { owner: true, otherDesigner: false, admin: true, reviewer: true, maker: false } },
    { status: 'approved' as DesignStatus, opens: { owner: true, otherDesigner: true, admin: true, reviewer: true, maker: true } },
  ])('when the design is $status, then each role sees canOpen exactly when GET /api/designs/:id answers 200', async ({ status, opens }) => {
    // Arrange
    const tag = uniqueTag();
    const design = await createDesign({ owner: users.owner, name: `${tag} listed stage`, status });
    for (const who of Object.keys(opens) as Array<keyof typeof opens>) {
      // Act
      const listed = await agents[who].get(`/api/designs?q=${tag}`);
      const read = await agents[who].get(`/api/designs/${design.id}`);
      // Assert
      expect(listed.status, who).toBe(200);
      expect(
        listed.body.items.map((d: { id: number; canOpen: boolean }) => [d.id, d.canOpen]),
        who,
      ).toEqual([[design.id, opens[who]]]);
      expect(read.status, who).toBe(opens[who] ? 200 : 403);
    }
  });
});

describe('export and import', () => {
  it('when exported, then the design document downloads as an attachment and imports back as a new draft', async () => {
    const design = await createDesign({
      owner: users.owner,
      name: 'Bench dispensing stage (rev B)',
      mechanism: 'corexy',
      edit: (doc) => ({ ...doc, frame: { ...doc.frame, outerXMm: 505 }, driver: { ...doc.driver, microsteps: 32 } }),
    });

    const exported = await agents.maker.get(`/api/designs/${design.id}/export`);
    const document = JSON.parse(exported.text) as DesignInput;
    const imported = await agents.otherDesigner.post('/api/designs').send({ ...document, name: 'Imported stage' });
    const got = await agents.otherDesigner.get(`/api/designs/${imported.body.id}`);

    expect(exported.status).toBe(200);
    expect(exported.headers['content-type']).toMatch(/^application\/json/);
    expect(exported.headers['content-disposition']).toMatch(/^attachment; filename="?bench-dispensing-stage-rev-b\.json"?$/);
    expect(document).toEqual(design.inputs);
    expect(document).toMatchObject({ schemaVersion: 1, mechanism: 'corexy', frame: { outerXMm: 505 }, driver: { microsteps: 32 } });
    expect(imported.status).toBe(201);
    expect(got.body.inputs).toEqual({ ...design.inputs, name: 'Imported stage' });
    expect(got.body).toMatchObject({ owner: { id: users.otherDesigner.id }, status: 'draft', version: 1 });
  });

  it('when an exported document is edited into an invalid one, then import answers 400 with the field', async () => {
    const design = await createDesign({ owner: users.owner });
    const exported = await agents.owner.get(`/api/designs/${design.id}/export`);
    const document = JSON.parse(exported.text) as Record<string, unknown>;
    document.schemaVersion = 2;

    const res = await agents.owner.post('/api/designs').send(document);

    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'schemaVersion', message: 'schemaVersion must be 1' }]);
  });

  it('when the design does not exist, then export is 404', async () => {
    const res = await agents.owner.get('/api/designs/2147483000/export');
    expect(res.status).toBe(404);
  });
});
