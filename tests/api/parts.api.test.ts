import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultDesign, safeParseDesign } from '@/engine';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { AuditLog, type Role } from '../../server/models';
import { DEMO_BELTS, DEMO_MOTORS, DEMO_PULLEYS } from '../../server/seeders/202612020101-demo-parts';
import { createPart, signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
afterAll(() => closeSequelize());

type Who = 'admin' | 'designer' | 'reviewer' | 'maker' | 'anonymous';
const agents = {} as Record<Who, Agent>;

beforeAll(async () => {
  for (const who of ['admin', 'designer', 'reviewer', 'maker'] as const) agents[who] = (await signedInAs(app, [who as Role])).agent;
  agents.anonymous = request.agent(app);
});

const uniqueTag = () => `p${randomBytes(5).toString('hex')}`;

const BELT = {
  profile: 'T5',
  standard: 'DIN 7721',
  pitchMm: 5,
  widthMm: 10,
  linearMassKgPerM: 0.024,
  axialStiffnessN: 120000,
  allowableTensionN: 400,
  minPulleyTeeth: 10,
  source: 'test data',
  note: 'from memory',
};
const PULLEY = { teeth: 20, pitchMm: 2, profile: '2 mm round tooth', kind: 'drive', boreMm: 5, inertiaKgM2: 1.2e-6, note: '' };
const MOTOR = {
  frameMm: 42,
  stepAngleDeg: 1.8,
  holdingTorqueNm: 0.45,
  ratedCurrentA: 1.5,
  phaseResistanceOhm: 1.8,
  phaseInductanceMh: 3.2,
  rotorInertiaKgM2: 5.7e-6,
  massKg: 0.28,
  torqueCurve: [
    { speedRevPerS: 0, torqueNm: 0.4 },
    { speedRevPerS: 10, torqueNm: 0.3 },
  ],
  torqueCurveConditions: { supplyV: 24, currentRmsA: 1.5 },
  note: '',
};
const SHELVES = [
  { shelf: 'belts', kind: 'belt', body: BELT },
  { shelf: 'pulleys', kind: 'pulley', body: PULLEY },
  { shelf: 'motors', kind: 'motor', body: MOTOR },
] as const;

describe('role matrix for /api/parts', () => {
  const READ = { admin: 200, designer: 200, reviewer: 200, maker: 200, anonymous: 401 };
  const WRITE_CREATE = { admin: 201, designer: 403, reviewer: 403, maker: 403, anonymous: 401 };
  const WRITE_PATCH = { admin: 200, designer: 403, reviewer: 403, maker: 403, anonymous: 401 };
  const cases = SHELVES.flatMap(({ shelf, kind, body }) => [
    { name: `GET /api/parts/${shelf}`, expected: READ, call: (a: Agent) => a.get(`/api/parts/${shelf}`) },
    {
      name: `GET /api/parts/${shelf}/:id`,
      expected: READ,
      call: async (a: Agent) => a.get(`/api/parts/${shelf}/${(await createPart(kind)).id}`),
    },
    {
      name: `POST /api/parts/${shelf}`,
      expected: WRITE_CREATE,
      call: (a: Agent) => a.post(`/api/parts/${shelf}`).send({ ...body, name: `Role ${uniqueTag()}` }),
    },
    {
      name: `PATCH /api/parts/${shelf}/:id`,
      expected: WRITE_PATCH,
      call: async (a: Agent) => a.patch(`/api/parts/${shelf}/${(await createPart(kind)).id}`).send({ note: 'checked' }),
    },
  ]).flatMap((route) => (Object.keys(route.expected) as Who[]).map((who) => ({ ...route, who, status: route.expected[who] })));

  it.each(cases)('when $who calls $name, then $status', async ({ call, who, status }) => {
    const res = await call(agents[who]);
    expect(res.status).toBe(status);
    if (status === 401) expect(res.body.error.code).toBe('unauthenticated');
    if (status === 403) expect(res.body.error.code).toBe('forbidden');
  });
});

describe('POST /api/parts/<shelf>', () => {
  it.each(SHELVES)(
    'when an admin adds to $shelf, then 201 with the fields as sent, and GET by id and the list return it',
    async ({ shelf, body }) => {
      const name = `Added ${uniqueTag()}`;

      const res = await agents.admin.post(`/api/parts/${shelf}`).send({ ...body, name });
      const got = await agents.maker.get(`/api/parts/${shelf}/${res.body.id}`);
      const listed = await agents.designer.get(`/api/parts/${shelf}?q=${encodeURIComponent(name)}`);

      expect(res.status).toBe(201);
      expect(res.body).toEqual({
        id: expect.any(Number),
        shelf,
        name,
        ...body,
        retired: false,
        createdAt: expect.any(String),
        updatedAt: expect.any(String),
      });
      expect(got.body).toEqual(res.body);
      expect(listed.body).toEqual({ items: [res.body], total: 1, page: 1, pageSize: 100 });
    },
  );

  it('when optional fields are left out, then defaults apply (empty standard/source/note, no pulley inertia, no torque table)', async () => {
    const { standard: _s, source: _so, note: _n, ...belt } = BELT;
    const { inertiaKgM2: _i, note: _pn, ...pulley } = PULLEY;
    const { torqueCurve: _t, torqueCurveConditions: _tc, note: _mn, ...motor } = MOTOR;

    const b = await agents.admin.post('/api/parts/belts').send({ ...belt, name: `Bare ${uniqueTag()}` });
    const p = await agents.admin.post('/api/parts/pulleys').send({ ...pulley, name: `Bare ${uniqueTag()}` });
    const m = await agents.admin.post('/api/parts/motors').send({ ...motor, name: `Bare ${uniqueTag()}` });

    expect(b.body).toMatchObject({ standard: '', source: '', note: '' });
    expect(p.body).toMatchObject({ inertiaKgM2: null, note: '' });
    expect(m.body).toMatchObject({ torqueCurve: null, torqueCurveConditions: null, note: '' });
  });

  it('when a form sends cleared text fields as null, then they are stored as empty text', async () => {
    const res = await agents.admin
      .post('/api/parts/belts')
      .send({ ...BELT, name: `Cleared ${uniqueTag()}`, standard: null, source: null, note: null });
    const patched = await agents.admin.patch(`/api/parts/belts/${res.body.id}`).send({ note: 'typed later' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ standard: '', source: '', note: '' });
    expect(patched.body).toMatchObject({ standard: '', note: 'typed later' });
  });

  it("when a belt is picked, then its fields fill a design's belt and the design is valid", async () => {
    const res = await agents.admin.post('/api/parts/belts').send({ ...BELT, name: `Pick ${uniqueTag()}` });
    const { pitchMm, widthMm, linearMassKgPerM, axialStiffnessN, allowableTensionN, minPulleyTeeth } = res.body;
    const motorPart = await agents.admin.post('/api/parts/motors').send({ ...MOTOR, name: `Pick ${uniqueTag()}` });
    const { stepAngleDeg, holdingTorqueNm, ratedCurrentA, phaseResistanceOhm, phaseInductanceMh, rotorInertiaKgM2, massKg, torqueCurve } =
      motorPart.body;
    const base = defaultDesign('corexy');

    const parsed = safeParseDesign({
      ...base,
      belt: { pitchMm, widthMm, linearMassKgPerM, axialStiffnessN, allowableTensionN, minPulleyTeeth },
      motor: {
        ...base.motor,
        stepAngleDeg,
        holdingTorqueNm,
        ratedCurrentA,
        phaseResistanceOhm,
        phaseInductanceMh,
        rotorInertiaKgM2,
        massKg,
        torqueCurve,
      },
    });

    expect(parsed.ok).toBe(true);
  });

  it.each([
    { shelf: 'belts', body: { ...BELT, pitchMm: -5 }, paths: ['pitchMm'] },
    { shelf: 'belts', body: { ...BELT, minPulleyTeeth: 12.5, colour: 'black' }, paths: ['minPulleyTeeth', 'colour'] },
    { shelf: 'belts', body: { ...BELT, name: '' }, paths: ['name'] },
    { shelf: 'pulleys', body: { ...PULLEY, kind: 'tensioner' }, paths: ['kind'] },
    { shelf: 'pulleys', body: { ...PULLEY, teeth: 3 }, paths: ['teeth'] },
    { shelf: 'motors', body: { ...MOTOR, frameMm: 42.5 }, paths: ['frameMm'] },
    { shelf: 'motors', body: { ...MOTOR, holdingTorqueNm: 'strong' }, paths: ['holdingTorqueNm'] },
    {
      shelf: 'motors',
      body: {
        ...MOTOR,
        torqueCurve: [
          { speedRevPerS: 5, torqueNm: 0.4 },
          { speedRevPerS: 5, torqueNm: 0.3 },
        ],
      },
      paths: ['torqueCurve.1.speedRevPerS'],
    },
    { shelf: 'motors', body: { ...MOTOR, torqueCurve: [{ speedRevPerS: 0, torqueNm: 0.4 }] }, paths: ['torqueCurve'] },
    { shelf: 'motors', body: { ...MOTOR, retired: true }, paths: ['retired'] },
  ])('when posting to $shelf with a bad field, then 400 names $paths', async ({ shelf, body, paths }) => {
    const res = await agents.admin.post(`/api/parts/${shelf}`).send({ name: `Bad ${uniqueTag()}`, ...body });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual(paths);
  });

  it('when a required field is missing, then 400 names it and nothing is stored', async () => {
    const name = `Missing ${uniqueTag()}`;
    const { pitchMm: _p, ...belt } = BELT;

    const res = await agents.admin.post('/api/parts/belts').send({ ...belt, name });
    const listed = await agents.admin.get(`/api/parts/belts?q=${encodeURIComponent(name)}&includeRetired=1`);

    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'pitchMm', message: 'must be a number' }]);
    expect(listed.body.total).toBe(0);
  });

  it('when the name is already on that shelf, then 409 part_name_taken; another shelf may use it', async () => {
    const name = `Twin ${uniqueTag()}`;
    await agents.admin.post('/api/parts/belts').send({ ...BELT, name });

    const again = await agents.admin.post('/api/parts/belts').send({ ...BELT, name });
    const otherShelf = await agents.admin.post('/api/parts/pulleys').send({ ...PULLEY, name });

    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({
      code: 'part_name_taken',
      details: [{ path: 'name', message: 'is already used by another belt' }],
    });
    expect(otherShelf.status).toBe(201);
  });

  it('when an admin adds a part, then the audit log records it', async () => {
    const res = await agents.admin.post('/api/parts/pulleys').send({ ...PULLEY, name: `Audited ${uniqueTag()}` });
    const entry = await AuditLog.findOne({ where: { entity: 'part', entityId: res.body.id } });
    expect(entry).toMatchObject({ action: 'part.create', toState: 'pulley' });
  });
});

describe('PATCH /api/parts/:kind/:id', () => {
  it('when an admin changes one field, then only that field changes (GET after shows it)', async () => {
    const created = await agents.admin.post('/api/parts/belts').send({ ...BELT, name: `Edit ${uniqueTag()}` });

    const res = await agents.admin.patch(`/api/parts/belts/${created.body.id}`).send({ allowableTensionN: 380, note: 'measured' });
    const got = await agents.designer.get(`/api/parts/belts/${created.body.id}`);

    expect(res.status).toBe(200);
    expect(got.body).toEqual({ ...created.body, allowableTensionN: 380, note: 'measured', updatedAt: expect.any(String) });
  });

  it("when a motor's torque table is cleared with null, then it reads back as null", async () => {
    const created = await agents.admin.post('/api/parts/motors').send({ ...MOTOR, name: `Curve ${uniqueTag()}` });
    const res = await agents.admin.patch(`/api/parts/motors/${created.body.id}`).send({ torqueCurve: null });
    expect(res.status).toBe(200);
    expect((await agents.admin.get(`/api/parts/motors/${created.body.id}`)).body.torqueCurve).toBeNull();
  });

  it('when the singular kind is used in the path, then it is the same shelf', async () => {
    const { id } = await createPart('pulley');
    const res = await agents.admin.patch(`/api/parts/pulley/${id}`).send({ boreMm: 8 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id, shelf: 'pulleys', boreMm: 8 });
  });

  it('when a change is invalid, then 400 and the part is unchanged', async () => {
    const created = await agents.admin.post('/api/parts/pulleys').send({ ...PULLEY, name: `Keep ${uniqueTag()}` });

    const bad = await agents.admin.patch(`/api/parts/pulleys/${created.body.id}`).send({ teeth: 0, kind: 'drive' });
    const empty = await agents.admin.patch(`/api/parts/pulleys/${created.body.id}`).send({});
    const unknown = await agents.admin.patch(`/api/parts/pulleys/${created.body.id}`).send({ colour: 'red' });
    const got = await agents.admin.get(`/api/parts/pulleys/${created.body.id}`);

    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path)).toEqual(['teeth']);
    expect(empty.status).toBe(400);
    expect(unknown.body.error.details).toEqual([{ path: 'colour', message: 'is not a known field' }]);
    expect(got.body).toEqual(created.body);
  });

  it('when renamed to a name taken on the shelf, then 409', async () => {
    const first = await createPart('motor');
    const second = await createPart('motor');
    const res = await agents.admin.patch(`/api/parts/motors/${second.id}`).send({ name: first.name });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('part_name_taken');
  });

  it.each([
    { what: 'a part of another shelf', path: async () => `/api/parts/motors/${(await createPart('belt')).id}`, status: 404 },
    { what: 'a missing id', path: async () => '/api/parts/belts/2147483000', status: 404 },
    { what: 'a non-numeric id', path: async () => '/api/parts/belts/abc', status: 400 },
    { what: 'an unknown shelf', path: async () => '/api/parts/screws/1', status: 404 },
  ])('when patching $what, then $status', async ({ path, status }) => {
    const res = await agents.admin.patch(await path()).send({ note: 'x' });
    expect(res.status).toBe(status);
  });
});

describe('retiring parts', () => {
  it('when a part is retired, then lists hide it unless includeRetired=1, GET by id still reads it, and restoring lists it again', async () => {
    const tag = uniqueTag();
    const keep = await createPart('belt', { name: `${tag} keep` });
    const old = await createPart('belt', { name: `${tag} old` });

    const retire = await agents.admin.patch(`/api/parts/belts/${old.id}`).send({ retired: true });
    const active = await agents.maker.get(`/api/parts/belts?q=${tag}`);
    const all = await agents.maker.get(`/api/parts/belts?q=${tag}&includeRetired=1`);
    const byId = await agents.maker.get(`/api/parts/belts/${old.id}`);
    const restore = await agents.admin.patch(`/api/parts/belts/${old.id}`).send({ retired: false });
    const afterRestore = await agents.maker.get(`/api/parts/belts?q=${tag}`);

    expect(retire.status).toBe(200);
    expect(retire.body.retired).toBe(true);
    expect(active.body.items.map((p: { id: number }) => p.id)).toEqual([keep.id]);
    expect(active.body.total).toBe(1);
    expect(all.body.items.map((p: { id: number; retired: boolean }) => [p.id, p.retired])).toEqual([
      [keep.id, false],
      [old.id, true],
    ]);
    expect(byId.status).toBe(200);
    expect(byId.body).toMatchObject({ id: old.id, retired: true });
    expect(restore.body.retired).toBe(false);
    expect(afterRestore.body.total).toBe(2);
  });

  it('when retired and restored, then both are audited', async () => {
    const { id } = await createPart('motor');
    await agents.admin.patch(`/api/parts/motors/${id}`).send({ retired: true });
    await agents.admin.patch(`/api/parts/motors/${id}`).send({ retired: false });
    const entries = await AuditLog.findAll({ where: { entity: 'part', entityId: id }, order: [['id', 'ASC']] });
    expect(entries.map((e) => [e.action, e.fromState, e.toState])).toEqual([
      ['part.retire', 'active', 'retired'],
      ['part.restore', 'retired', 'active'],
    ]);
  });
});

describe('GET /api/parts/<shelf> (list)', () => {
  it('when paging, then total counts all matches, pages split them and a page beyond the end is empty', async () => {
    const tag = uniqueTag();
    for (const n of [3, 1, 2]) await createPart('pulley', { name: `${tag} ${n}` });

    const first = await agents.designer.get(`/api/parts/pulleys?q=${tag}&pageSize=2`);
    const second = await agents.designer.get(`/api/parts/pulleys?q=${tag}&pageSize=2&page=2`);
    const beyond = await agents.designer.get(`/api/parts/pulleys?q=${tag}&pageSize=2&page=5`);

    expect(first.body).toMatchObject({ total: 3, page: 1, pageSize: 2 });
    expect(first.body.items.map((p: { name: string }) => p.name)).toEqual([`${tag} 1`, `${tag} 2`]);
    expect(second.body.items.map((p: { name: string }) => p.name)).toEqual([`${tag} 3`]);
    expect(beyond.body).toEqual({ items: [], total: 3, page: 5, pageSize: 2 });
  });

  it('when listing one shelf, then parts of other shelves are not in it', async () => {
    const tag = uniqueTag();
    await createPart('belt', { name: `${tag} belt` });
    await createPart('motor', { name: `${tag} motor` });
    const res = await agents.designer.get(`/api/parts/motors?q=${tag}`);
    expect(res.body.items.map((p: { name: string; shelf: string }) => [p.name, p.shelf])).toEqual([[`${tag} motor`, 'motors']]);
  });

  it.each([
    { query: 'pageSize=0', path: 'pageSize' },
    { query: 'pageSize=101', path: 'pageSize' },
    { query: 'page=0', path: 'page' },
    { query: 'includeRetired=yes', path: 'includeRetired' },
  ])('when the query has $query, then 400 names $path', async ({ query, path }) => {
    const res = await agents.designer.get(`/api/parts/belts?${query}`);
    expect(res.status).toBe(400);
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual([path]);
  });
});

describe('starter catalogue', () => {
  // The demo seeder's shelf goes through the same validation as an admin's POST, so every starter part is
  // one the API itself would accept. Tests never depend on the seed; they post copies under fresh names.
  const entries = [
    ...DEMO_BELTS.map((b) => ({ shelf: 'belts', body: b as Record<string, unknown> })),
    ...DEMO_PULLEYS.map((p) => ({ shelf: 'pulleys', body: p as Record<string, unknown> })),
    ...DEMO_MOTORS.map((m) => ({ shelf: 'motors', body: m as Record<string, unknown> })),
  ];

  it.each(entries)('when "$body.name" is posted to $shelf, then the API accepts it', async ({ shelf, body }) => {
    const res = await agents.admin.post(`/api/parts/${shelf}`).send({ ...body, name: `${String(body.name)} ${uniqueTag()}` });
    expect(res.status).toBe(201);
  });

  it('when every starter belt is used in the template design, then the design is valid', () => {
    const base = defaultDesign('corexy');
    for (const belt of DEMO_BELTS) {
      const { pitchMm, widthMm, linearMassKgPerM, axialStiffnessN, allowableTensionN, minPulleyTeeth } = belt;
      const parsed = safeParseDesign({
        ...base,
        belt: { pitchMm, widthMm, linearMassKgPerM, axialStiffnessN, allowableTensionN, minPulleyTeeth },
      });
      expect(parsed.ok, belt.name).toBe(true);
    }
  });

  it('when the starter shelf is read, then the belt pitches are the nominal pitches of their standards', () => {
    // ISO 5296: MXL 0.080 in, XL 0.200 in, L 0.375 in; DIN 7721: T2.5, T5, T10; ISO 13050: 3M, 5M;
    // 2 mm and 3 mm round-tooth belts: common practice.
    const expected: Record<string, number> = {
      MXL: 0.08 * 25.4,
      XL: 0.2 * 25.4,
      L: 0.375 * 25.4,
      'T2.5': 2.5,
      T5: 5,
      T10: 10,
      '3M': 3,
      '5M': 5,
      '2 mm round tooth': 2,
      '3 mm round tooth': 3,
    };
    expect([...new Set(DEMO_BELTS.map((b) => b.profile))].sort()).toEqual(Object.keys(expected).sort());
    for (const belt of DEMO_BELTS) expect(belt.pitchMm, belt.name).toBeCloseTo(expected[belt.profile], 9);
    expect(DEMO_BELTS.map((b) => b.standard)).toContain('ISO 13050 (2014/2022 eds.)');
  });
});
