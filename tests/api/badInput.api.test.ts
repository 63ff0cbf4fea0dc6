import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { defaultDesign } from '@/engine';
import { createApprovedSheet, createDesign, createUser, signIn, type Agent } from '../helpers/factories';
import { routeLabel, walkRoutes } from '../helpers/routeTable';

/**
 * Sweep of every API route — read from the real router, not from a list kept by hand — with malformed input. The rule under test: bad input always gets
 * a clear error (4xx with `{error: {code, message}}`, field `details` with a `path` for validation errors), never
 * a 5xx, and never changes saved data.
 */
const app = createApp();
let admin: Agent;
let adminId: number;
let sheetId: number;
let designId: number;

const UNKNOWN_ID = '987654321';
const BAD_IDS = ['abc', '1.5', '-1', '0', '99999999999999999999', '1e3', '0x10'];

/** `formNumber`: a number that a multipart form sends as text, so numeric text is fine in JSON too. */
type FieldType = 'string' | 'number' | 'formNumber' | 'boolean' | 'array' | 'object' | 'design';
type Route = {
  method: 'get' | 'post' | 'patch' | 'delete';
  /** Path with `:id` (and `:measurementId`) placeholders. */
  path: string;
  /** How the route takes a body. */
  body?: 'json' | 'multipart' | 'both';
  /** A body that passes validation (for the unknown-id check). */
  valid?: Record<string, unknown>;
  /** Body fields and their type; `nullable` ones accept null. */
  fields?: Record<string, FieldType | `${FieldType}?null`>;
  /** List routes: their query parameters that take an enumerated or sorted value. */
  query?: string[];
  /** No sign-in needed. */
  isPublic?: boolean;
  /** The body may be left out (every field optional). */
  isBodyOptional?: boolean;
  /** The route looks its target up before reading the body (multipart routes), so body checks need a real target. */
  checksTargetFirst?: boolean;
};

const designDoc = { name: 'x', mechanism: 'corexy' };

/** Bad values for each query parameter a list route may take. */
const BAD_QUERY_VALUES: Record<string, string[]> = {
  page: ['0', '-1', 'abc', '1.5', '99999999999999999999999'],
  pageSize: ['0', '1000', 'abc'],
  sort: ['bogus', '--name', 'name;drop'],
  status: ['bogus', ','],
  mechanism: ['bogus'],
  owner: ['someone', '-1'],
  entityId: ['abc', '-1'],
  designId: ['abc', '0', '99999999999999999999'],
  current: ['maybe'],
  includeRetired: ['yes'],
  paper: ['A3', 'bogus'],
};

/**
 * What the sweep needs to know beyond what the router says (a valid body, the type of each field, …), keyed by
 * route. The routes themselves come from the router: a route without hints is still swept with what its middleware
 * tells (sign-in, upload, schemas), and a hint for a route that no longer exists fails the first test below.
 */
const HINTS: Route[] = [
  // health.routes.ts
  { method: 'get', path: '/api/health', isPublic: true },
  // auth.routes.ts
  // fix: login, forgot and reset ignored unknown body fields (200/202 instead of 400); their schemas are strict now.
  { method: 'post', path: '/api/auth/login', body: 'json', isPublic: true, fields: { email: 'string', password: 'string' } },
  { method: 'post', path: '/api/auth/logout', isPublic: true },
  { method: 'get', path: '/api/auth/me' },
  { method: 'post', path: '/api/auth/forgot', body: 'json', isPublic: true, fields: { email: 'string' } },
  { method: 'post', path: '/api/auth/reset', body: 'json', isPublic: true, fields: { token: 'string', password: 'string' } },
  // users.routes.ts
  { method: 'get', path: '/api/users', query: ['page', 'pageSize'] },
  { method: 'get', path: '/api/users/:id' },
  { method: 'post', path: '/api/users', body: 'json', fields: { email: 'string', name: 'string', roles: 'array' } },
  {
    method: 'patch',
    path: '/api/users/:id',
    body: 'json',
    valid: { name: 'Nobody' },
    fields: { name: 'string', roles: 'array', disabled: 'boolean' },
  },
  // audit.routes.ts, outbox.routes.ts
  { method: 'get', path: '/api/audit', query: ['page', 'pageSize', 'entityId'] },
  { method: 'get', path: '/api/outbox', query: ['page', 'pageSize'] },
  // designs.routes.ts
  { method: 'get', path: '/api/designs', query: ['page', 'pageSize', 'sort', 'status', 'mechanism', 'owner'] },
  { method: 'post', path: '/api/designs', body: 'json', fields: { template: 'string', name: 'string' } },
  { method: 'get', path: '/api/designs/:id' },
  { method: 'get', path: '/api/designs/:id/export' },
  {
    method: 'patch',
    path: '/api/designs/:id',
    body: 'json',
    valid: { name: 'x', version: 1 },
    fields: { inputs: 'design', name: 'string', version: 'number' },
  },
  { method: 'delete', path: '/api/designs/:id' },
  // designFlow.routes.ts
  { method: 'post', path: '/api/designs/:id/submit', body: 'json', valid: {}, isBodyOptional: true, fields: { version: 'number' } },
  { method: 'post', path: '/api/designs/:id/withdraw', body: 'json', valid: {}, isBodyOptional: true },
  { method: 'post', path: '/api/designs/:id/reopen', body: 'json', valid: {}, isBodyOptional: true },
  { method: 'get', path: '/api/designs/:id/revisions' },
  // attachments.routes.ts
  { method: 'post', path: '/api/designs/:id/attachments', body: 'multipart' },
  { method: 'get', path: '/api/designs/:id/attachments', query: ['page', 'pageSize'] },
  // designJob.routes.ts
  { method: 'post', path: '/api/designs/:id/job', body: 'multipart' },
  { method: 'get', path: '/api/attachments/:id' },
  { method: 'delete', path: '/api/attachments/:id' },
  // parts.routes.ts (each shelf, plural and singular segments)
  ...(['belts', 'pulleys', 'motors'] as const).flatMap((shelf): Route[] => [
    { method: 'get', path: `/api/parts/${shelf}`, query: ['page', 'pageSize', 'includeRetired'] },
    { method: 'post', path: `/api/parts/${shelf}`, body: 'json', fields: { name: 'string', pitchMm: 'number', note: 'string?null' } },
    { method: 'get', path: `/api/parts/${shelf}/:id` },
    { method: 'get', path: `/api/parts/${shelf.slice(0, -1)}/:id` },
    {
      method: 'patch',
      path: `/api/parts/${shelf}/:id`,
      body: 'json',
      valid: { name: 'x' },
      fields: { name: 'string', retired: 'boolean' },
    },
    {
      method: 'patch',
      path: `/api/parts/${shelf.slice(0, -1)}/:id`,
      body: 'json',
      valid: { name: 'x' },
      fields: { name: 'string', retired: 'boolean' },
    },
  ]),
  // torqueCurves.routes.ts
  { method: 'post', path: '/api/parts/motors/:id/torque-curve', body: 'multipart' },
  { method: 'get', path: '/api/parts/motors/:id/torque-curve' },
  // calc.routes.ts
  { method: 'post', path: '/api/calc', body: 'json', fields: { design: 'design' } },
  { method: 'post', path: '/api/calc/compare', body: 'json', fields: { design: 'design' } },
  { method: 'post', path: '/api/calc/sweep', body: 'json', fields: { design: 'design', path: 'string', values: 'array' } },
  // revisions.routes.ts
  { method: 'get', path: '/api/revisions', query: ['page', 'pageSize', 'status', 'designId'] },
  { method: 'get', path: '/api/revisions/:id' },
  { method: 'get', path: '/api/revisions/:id/diff' },
  { method: 'get', path: '/api/revisions/:id/comments' },
  {
    method: 'post',
    path: '/api/revisions/:id/comments',
    body: 'json',
    valid: { body: 'hello' },
    fields: { body: 'string', parentId: 'number?null' },
  },
  {
    method: 'post',
    path: '/api/revisions/:id/approve',
    body: 'json',
    valid: { comment: 'ok' },
    isBodyOptional: true,
    fields: { comment: 'string' },
  },
  { method: 'post', path: '/api/revisions/:id/return', body: 'json', valid: { reason: 'fix it' }, fields: { reason: 'string' } },
  // sheets.routes.ts
  { method: 'get', path: '/api/sheets', query: ['page', 'pageSize', 'designId', 'current'] },
  { method: 'get', path: '/api/sheets/:id' },
  { method: 'get', path: '/api/sheets/:id/pdf', query: ['paper'] },
  // measurements.routes.ts
  {
    method: 'post',
    path: '/api/sheets/:id/measurements',
    body: 'both',
    checksTargetFirst: true,
    valid: { spanId: 'x', frequencyHz: 100 },
    fields: { spanId: 'string', frequencyHz: 'formNumber' },
  },
  { method: 'get', path: '/api/sheets/:id/measurements', query: ['page', 'pageSize'] },
  { method: 'get', path: '/api/sheets/:id/measurements/:measurementId' },
  { method: 'get', path: '/api/sheets/:id/measurements/:measurementId/recording' },
];

/** The zod object fields a schema knows (through .extend, .optional, pipes), for the query sweep. */
function fieldsOf(schema: unknown): string[] {
  const s = schema as { shape?: Record<string, unknown>; def?: { in?: unknown; innerType?: unknown; schema?: unknown } } | undefined;
  if (s?.shape && typeof s.shape === 'object') return Object.keys(s.shape);
  return s?.def ? fieldsOf(s.def.in ?? s.def.innerType ?? s.def.schema) : [];
}

const WALKED = walkRoutes();
const hintFor = new Map(HINTS.map((h) => [`${h.method.toUpperCase()} ${h.path}`, h]));
const ROUTES: Route[] = WALKED.map((r) => {
  const hint = hintFor.get(routeLabel(r));
  const queryKeys = fieldsOf(r.schemas.query).filter((k) => k in BAD_QUERY_VALUES);
  return {
    ...hint,
    method: r.method as Route['method'],
    path: r.path,
    isPublic: !r.isSignedIn,
    body: r.isUpload ? (hint?.body ?? 'multipart') : r.schemas.body ? (hint?.body ?? 'json') : undefined,
    query: r.schemas.query && queryKeys.length ? queryKeys : undefined,
  };
});

const withIds = (path: string, id: string, measurementId = id) => path.replace(':measurementId', measurementId).replace(':id', id);
const label = (r: Route) => `${r.method.toUpperCase()} ${r.path}`;

/** Nested 50 levels deep: {a:{a:…[1,[2,…]]}}. */
function deepJunk(levels = 50): unknown {
  let value: unknown = ['bottom'];
  for (let i = 0; i < levels; i++) value = i % 2 ? { a: value } : [value];
  return value;
}

/** Values of the wrong JSON type for a field of type `type`. */
function wrongValues(type: string): unknown[] {
  const [base, nullable] = type.split('?');
  const all: Record<string, unknown> = {
    string: 'not-what-you-want-12abc',
    number: 42.5,
    boolean: true,
    array: [1, 'two', null],
    object: { nested: { junk: [] } },
    deep: deepJunk(),
  };
  const values = Object.entries(all)
    .filter(([k]) => k !== base && !(base === 'design' && k === 'object') && !(base === 'formNumber' && k === 'number'))
    .map(([, v]) => v);
  // A design field is an object: a string, number, boolean, array or nested array is wrong for it.
  if (!nullable) values.push(null);
  if (base === 'number') values.push('12', '1e3', '');
  if (base === 'formNumber') values.push('twelve', '12 Hz', 'Infinity');
  if (base === 'boolean') values.push('true', 1);
  return values;
}

/** Asserts the answer is a 4xx JSON error of the documented shape and returns its body's error. */
function expectClientError(res: request.Response, where: string, allowed?: number[]): { code: string; message: string; details?: unknown } {
  const context = `${where} → ${res.status} ${res.headers['content-type']} ${JSON.stringify(res.body).slice(0, 300)}`;
  expect(res.status, context).toBeGreaterThanOrEqual(400);
  expect(res.status, context).toBeLessThan(500);
  if (allowed) expect(allowed, context).toContain(res.status);
  expect(res.headers['content-type'], context).toMatch(/application\/json/);
  expect(typeof res.body?.error?.code, context).toBe('string');
  expect(typeof res.body?.error?.message, context).toBe('string');
  expect(res.body.error.message.length, context).toBeGreaterThan(0);
  if (res.body.error.code === 'validation_failed') {
    expect(Array.isArray(res.body.error.details), context).toBe(true);
    expect(res.body.error.details.length, context).toBeGreaterThan(0);
    for (const d of res.body.error.details) {
      expect(typeof d.path, context).toBe('string');
      expect(typeof d.message, context).toBe('string');
    }
  }
  return res.body.error;
}

function send(agent: Agent | request.Agent, r: Route, path: string, body?: unknown): request.Test {
  const req = (agent as Agent)[r.method](path);
  return body === undefined ? req : req.send(body as object);
}

beforeAll(async () => {
  const created = await createUser({ roles: ['admin'] });
  adminId = created.user.id;
  admin = await signIn(app, created.email, created.password);
  const designer = await createUser({ roles: ['designer'] });
  designId = (await createDesign({ owner: designer.user })).id;
  ({ sheetId } = await createApprovedSheet({ owner: designer.user, approver: created.user }));
});
afterAll(() => closeSequelize());

describe('the route list', () => {
  it('when the router is walked, then every route is swept and every hint names a route that exists', () => {
    const labels = new Set(WALKED.map(routeLabel));
    expect(WALKED.length).toBeGreaterThan(60);
    expect([...hintFor.keys()].filter((l) => !labels.has(l))).toEqual([]);
    expect(ROUTES.map(label)).toEqual(WALKED.map(routeLabel));
  });
});

const idRoutes = ROUTES.filter((r) => r.path.includes(':id'));
const bodyRoutes = ROUTES.filter((r) => r.body === 'json' || r.body === 'both');

describe('ids in the path', () => {
  it.each(idRoutes.flatMap((r) => BAD_IDS.map((id) => [label(r), id, r] as const)))(
    'when %s gets id %s, then 400 names the id',
    async (_l, id, r) => {
      const res = await send(admin, r, withIds(r.path, id, '1'), r.valid);
      const error = expectClientError(res, `${label(r)} id=${id}`, [400]);
      expect(error.code).toBe('validation_failed');
      expect((error.details as { path: string }[]).map((d) => d.path)).toContain('id');
    },
  );

  it.each(idRoutes.filter((r) => r.path.includes(':measurementId')).flatMap((r) => BAD_IDS.map((id) => [label(r), id, r] as const)))(
    'when %s gets measurement id %s, then 400 names measurementId',
    async (_l, id, r) => {
      const res = await send(admin, r, withIds(r.path, String(sheetId), id));
      const error = expectClientError(res, `${label(r)} measurementId=${id}`, [400]);
      expect((error.details as { path: string }[]).map((d) => d.path)).toContain('measurementId');
    },
  );

  it.each(idRoutes.map((r) => [label(r), r] as const))('when %s gets an unknown id, then 404', async (_l, r) => {
    const res = await send(admin, r, withIds(r.path, UNKNOWN_ID), r.valid);
    expect(expectClientError(res, `${label(r)} unknown id`, [404]).code).toMatch(/not_found/);
  });

  it.each(idRoutes.filter((r) => r.path.includes(':measurementId')).map((r) => [label(r), r] as const))(
    'when %s names a real sheet but an unknown measurement, then 404',
    async (_l, r) => {
      const res = await send(admin, r, withIds(r.path, String(sheetId), UNKNOWN_ID));
      expectClientError(res, `${label(r)} unknown measurement`, [404]);
    },
  );
});

describe('JSON bodies', () => {
  // An unknown id: an id route validates its body before it looks the id up, and nothing can change by mistake.
  const target = (r: Route) => withIds(r.path, r.checksTargetFirst ? String(sheetId) : UNKNOWN_ID);

  it.each(
    bodyRoutes.flatMap((r) =>
      Object.entries(r.fields ?? {}).flatMap(([field, type]) =>
        wrongValues(type).map((value, i) => [label(r), field, i, r, value] as const),
      ),
    ),
  )('when %s gets a wrong type for %s (#%i), then 4xx and never 5xx', async (_l, field, _i, r, value) => {
    const res = await send(admin, r, target(r), { ...(r.valid ?? {}), [field]: value });
    const error = expectClientError(res, `${label(r)} ${field}=${JSON.stringify(value).slice(0, 40)}`);
    expect(error.code).toBe('validation_failed');
    expect((error.details as { path: string }[]).some((d) => d.path === field || d.path.startsWith(`${field}.`))).toBe(true);
  });

  const shapes: [string, unknown][] = [
    ['an array', [{ a: 1 }]],
    ['an extra unknown field', { ...designDoc, unexpectedField: 1, __proto__x: { polluted: true } }],
    ['deeply nested junk', { junk: deepJunk(500) }],
  ];
  it.each(bodyRoutes.flatMap((r) => shapes.map(([what, body]) => [label(r), what, r, body] as const)))(
    'when %s gets %s, then 400',
    async (_l, _what, r, body) => {
      const res = await send(admin, r, target(r), Array.isArray(body) ? body : { ...(r.valid ?? {}), ...(body as object) });
      expectClientError(res, `${label(r)} ${_what}`, [400]);
    },
  );

  it.each(bodyRoutes.filter((r) => !r.isBodyOptional).map((r) => [label(r), r] as const))(
    'when %s gets an empty body, then 400 validation_failed',
    async (_l, r) => {
      const empty = await send(admin, r, target(r));
      const emptyObject = await send(admin, r, target(r), {});
      expect(expectClientError(empty, `${label(r)} no body`, [400]).code).toBe('validation_failed');
      expect(expectClientError(emptyObject, `${label(r)} {}`, [400]).code).toBe('validation_failed');
    },
  );

  it.each(bodyRoutes.map((r) => [label(r), r] as const))(
    'when %s gets JSON null, a bare string or broken JSON, then 400 invalid_json',
    async (_l, r) => {
      for (const raw of ['null', '"text"', '12', '{"a": ', '{"a":1}}']) {
        const res = await admin[r.method](target(r)).set('Content-Type', 'application/json').send(raw);
        expect(expectClientError(res, `${label(r)} raw ${raw}`, [400]).code).toBe('invalid_json');
      }
    },
  );

  it.each(bodyRoutes.filter((r) => r.body === 'json').map((r) => [label(r), r] as const))(
    'when %s gets text/plain, then 415',
    async (_l, r) => {
      const res = await admin[r.method](target(r)).set('Content-Type', 'text/plain').send('email=a&name=b');
      expectClientError(res, `${label(r)} text/plain`, [415]);
    },
  );

  it.each(bodyRoutes.filter((r) => r.body === 'json').map((r) => [label(r), r] as const))(
    'when %s gets a multipart form, then 4xx',
    async (_l, r) => {
      const res = await admin[r.method](target(r)).field('name', 'x').attach('file', Buffer.from('hello'), 'a.txt');
      expectClientError(res, `${label(r)} multipart`, [400, 404, 415]);
    },
  );
});

describe('extreme values on real records', () => {
  // Right type, absurd size: integers past 2^53 or past the INT columns must be refused, not sent to the database.
  const HUGE = [1e300, 2 ** 53 + 2, -1e300, 2_147_483_648];
  let revisionId: number;
  beforeAll(async () => {
    const designer = await createUser({ roles: ['designer'] });
    ({ revisionId } = await createApprovedSheet({ owner: designer.user, approver: (await createUser({ roles: ['reviewer'] })).user }));
  });

  it.each(HUGE)('when numbers are %d, then every route answers 4xx and the design keeps its version', async (n) => {
    const cases: [string, () => request.Test][] = [
      ['PATCH design version', () => admin.patch(`/api/designs/${designId}`).send({ name: 'renamed', version: n })],
      ['POST design copyOf', () => admin.post('/api/designs').send({ copyOf: n })],
      ['POST submit version', () => admin.post(`/api/designs/${designId}/submit`).send({ version: n })],
      ['POST comment parentId', () => admin.post(`/api/revisions/${revisionId}/comments`).send({ body: 'hi', parentId: n })],
      ['POST sweep values', () => admin.post('/api/calc/sweep').send({ design: designDoc, path: 'pulley.driveTeeth', values: [n] })],
      ['POST measurement frequency', () => admin.post(`/api/sheets/${sheetId}/measurements`).send({ spanId: 'x', frequencyHz: n })],
      ['GET audit entityId', () => admin.get(`/api/audit?entityId=${n}`)],
      ['GET designs page', () => admin.get(`/api/designs?page=${n}`)],
    ];
    for (const [what, call] of cases) {
      const res = await call();
      if (res.status < 400 && /^GET/.test(what)) {
        // A far page of a list is an empty page, not an error.
        expect(res.status, `${what} ${n}`).toBe(200);
        continue;
      }
      expectClientError(res, `${what} ${n}`);
    }
    expect((await admin.get(`/api/designs/${designId}`)).body.version).toBe(1);
  });
});

describe('design documents with junk inside', () => {
  /** Dotted paths of every number in a template design. */
  function numberPaths(value: unknown, prefix = ''): string[] {
    if (typeof value === 'number') return [prefix];
    if (value && typeof value === 'object') {
      return Object.entries(value as Record<string, unknown>).flatMap(([k, v]) => numberPaths(v, prefix ? `${prefix}.${k}` : k));
    }
    return [];
  }
  function withValue(doc: unknown, path: string, value: unknown): object {
    const copy = structuredClone(doc) as Record<string, unknown>;
    const keys = path.split('.');
    let node = copy;
    for (const key of keys.slice(0, -1)) node = node[key] as Record<string, unknown>;
    node[keys[keys.length - 1]] = value;
    return copy;
  }
  const template = defaultDesign('corexy');

  it.each(numberPaths(template))('when design.%s is absurd, then calc, compare and create answer 200 or 4xx, never 5xx', async (path) => {
    for (const value of [1e308, -1e308, 0, -1, 1e-300, 'abc', null, [], {}]) {
      const design = withValue(template, path, value);
      for (const [what, call] of [
        ['calc', () => admin.post('/api/calc').send({ design })],
        ['compare', () => admin.post('/api/calc/compare').send({ design })],
        ['create', () => admin.post('/api/designs').send(design)],
      ] as const) {
        const res = await call();
        const where = `${what} ${path}=${JSON.stringify(value)}`;
        if (res.status < 400) {
          expect(res.status, where).toBeLessThan(300);
          if (what === 'create') await admin.delete(`/api/designs/${res.body.id}`);
          continue;
        }
        const error = expectClientError(res, where, [400]);
        // The details name a field of the document (not always this one: a frame rule may refuse what a part leaves).
        if (error.code === 'validation_failed') expect((error.details as { path: string }[]).length, where).toBeGreaterThan(0);
      }
    }
  });
});

describe('multipart routes', () => {
  const multipart = ROUTES.filter((r) => r.body === 'multipart' || r.body === 'both');
  const realTarget = (r: Route) => withIds(r.path, String(r.path.startsWith('/api/sheets') ? sheetId : designId));

  it.each(multipart.map((r) => [label(r), r] as const))(
    'when %s gets JSON junk instead of a form, then 400 naming the field',
    async (_l, r) => {
      for (const body of [{}, { file: 'not a file' }, { spanId: ['x'], frequencyHz: 'abc' }, [1, 2]]) {
        const res = await send(admin, r, realTarget(r), body);
        const error = expectClientError(res, `${label(r)} JSON ${JSON.stringify(body)}`, [400, 404]);
        if (error.code === 'validation_failed') expect((error.details as unknown[]).length).toBeGreaterThan(0);
      }
    },
  );

  it.each(multipart.map((r) => [label(r), r] as const))('when %s gets text/plain, then 415', async (_l, r) => {
    const res = await admin.post(realTarget(r)).set('Content-Type', 'text/plain').send('hello');
    expectClientError(res, `${label(r)} text/plain`, [415]);
  });

  it.each(multipart.map((r) => [label(r), r] as const))('when %s gets a form with an unknown field, then 400', async (_l, r) => {
    const res = await admin.post(realTarget(r)).field('colour', 'red').attach('file', Buffer.from('hello'), 'a.txt');
    expectClientError(res, `${label(r)} unknown form field`, [400, 404, 415]);
  });
});

describe('query parameters', () => {
  const lists = ROUTES.filter((r) => r.query);
  const listPath = (r: Route) => withIds(r.path, String(r.path.startsWith('/api/sheets') ? sheetId : designId));

  it.each(lists.flatMap((r) => r.query!.flatMap((q) => (BAD_QUERY_VALUES[q] ?? []).map((v) => [label(r), q, v, r] as const))))(
    'when %s gets %s=%s, then 400 names the parameter',
    async (_l, q, v, r) => {
      const res = await admin.get(`${listPath(r)}?${q}=${encodeURIComponent(v)}`);
      const error = expectClientError(res, `${label(r)} ${q}=${v}`, [400]);
      expect((error.details as { path: string }[]).map((d) => d.path)).toContain(q);
    },
  );

  it.each(lists.filter((r) => r.query!.includes('page')).map((r) => [label(r), r] as const))(
    'when %s gets page twice, then 400',
    async (_l, r) => {
      const res = await admin.get(`${listPath(r)}?page=1&page=2`);
      expectClientError(res, `${label(r)} page twice`, [400]);
    },
  );
});

describe('signed out', () => {
  it.each(ROUTES.filter((r) => !r.isPublic).map((r) => [label(r), r] as const))(
    'when nobody is signed in, %s answers 401 JSON',
    async (_l, r) => {
      const res = await send(request.agent(app), r, withIds(r.path, 'abc'), { junk: [1] });
      expect(expectClientError(res, `${label(r)} anonymous`, [401]).code).toBe('unauthenticated');
    },
  );

  it.each(ROUTES.filter((r) => r.isPublic && r.fields).map((r) => [label(r), r] as const))(
    'when nobody is signed in, %s still validates',
    async (_l, r) => {
      const res = await send(request.agent(app), r, r.path, { junk: [1] });
      expect(expectClientError(res, `${label(r)} anonymous junk`, [400]).code).toBe('validation_failed');
    },
  );
});

describe('saved data stays', () => {
  it('when the sweep ran, then the admin, the design and the sheet are unchanged', async () => {
    const me = await admin.get('/api/auth/me');
    const design = await admin.get(`/api/designs/${designId}`);
    const sheet = await admin.get(`/api/sheets/${sheetId}`);
    expect(me.body.user).toMatchObject({ id: adminId, disabled: false, roles: ['admin'] });
    expect(design.status).toBe(200);
    expect(design.body.version).toBe(1);
    expect(sheet.status).toBe(200);
  });
});
