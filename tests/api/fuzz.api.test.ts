import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { defaultDesign } from '@/engine';
import { createApp } from '../../server/app';
import { resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { createApprovedSheet, createDesign, createPart, createUser } from '../helpers/factories';
import { fillPath, routeLabel, walkRoutes, type ApiRoute } from '../helpers/routeTable';

/**
 * Fuzz sweep (issue 12, item 9): at least 10,000 generated requests over every route of the real router — junk ids,
 * query strings, JSON and multipart bodies, lone surrogates, wrong content types and encodings, as an admin, as an
 * account without a role and signed out — must answer 0 × 5xx, and every error must have the usual shape.
 * Deterministic: FUZZ_SEED picks another sequence, FUZZ_REQUESTS another length.
 *
 * It never touches another test file's rows: ids are this file's own fixtures, unknown or malformed; routes that end
 * the caller's own session go out signed out; every request comes from an address of its own (X-Forwarded-For over a
 * trusted loopback proxy) so the per-address limits of the other files are not touched.
 */
const SEED = Number(process.env.FUZZ_SEED ?? 12_012);
const REQUESTS = Math.max(10_000, Number(process.env.FUZZ_REQUESTS ?? 10_000));
const IN_FLIGHT = 16;
const SAVED_ENV = { ...process.env };

let server: Server;
let base: string;
const cookies: Record<'admin' | 'noRole', string> = { admin: '', noRole: '' };
const own: Record<string, number> = {};

/** mulberry32: a small, fast, seedable PRNG. */
function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return { next, int: (n: number) => Math.floor(next() * n), pick: <T>(list: readonly T[]): T => list[Math.floor(next() * list.length)] };
}
const rnd = prng(SEED);

async function login(email: string, password: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`login failed: ${res.status}`);
  return (res.headers.get('set-cookie') ?? '').split(';')[0];
}

beforeAll(async () => {
  Object.assign(process.env, { TRUST_PROXY: 'loopback' });
  resetConfigCache();
  server = createApp().listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const admin = await createUser({ roles: ['admin'] });
  const noRole = await createUser({ roles: [] });
  const designer = await createUser({ roles: ['designer'] });
  cookies.admin = await login(admin.email, admin.password);
  cookies.noRole = await login(noRole.email, noRole.password);
  own.user = designer.user.id;
  own.design = (await createDesign({ owner: admin.user })).id;
  own.part = (await createPart('motor')).id;
  const sheet = await createApprovedSheet({ owner: designer.user, approver: admin.user });
  own.sheet = sheet.sheetId;
  own.revision = sheet.revisionId;
  const submitted = await fetch(`${base}/api/designs/${(await createDesign({ owner: admin.user })).id}/submit`, {
    method: 'POST',
    headers: { Cookie: cookies.admin, 'Content-Type': 'application/json' },
    body: '{}',
  });
  own.reviewRevision = ((await submitted.json()) as { id: number }).id;
}, 60_000);

afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  server.closeAllConnections();
  process.env = SAVED_ENV;
  resetConfigCache();
  await closeSequelize();
});

// ---------------------------------------------------------------------------------------------------------------
// What the requests are made of.

const LONE = ['\ud800', '\udfff', 'a\ud83db', '\udc00x'];
const STRINGS = [
  '',
  ' ',
  'x',
  'Gantry stage',
  'ümlaut ✓ 🛠',
  'a'.repeat(300),
  'b'.repeat(5000),
  '<script>alert(1)</script>',
  "' OR 1=1 --",
  '%00',
  '\u0000',
  '__proto__',
  'constructor',
  '../../etc/passwd',
  '1e309',
  'NaN',
  '-0',
  'true',
  'null',
  '[]',
  '{}',
  'x@example.test',
  'not-an-email',
  'A'.repeat(43),
  'corexy',
  'hbot',
  'cartesian',
  'designer',
  'admin',
  'in_review',
  'A4',
  'LETTER',
  '-updatedAt',
  'name',
  '2026-12-04T10:00:00Z',
  ...LONE,
];
const NUMBERS = [0, -1, 1, 2, 1.5, -0.0001, 1e-300, 1e308, -1e308, 2_147_483_648, 987_654_321, Number.MAX_SAFE_INTEGER, 100, 5000, 12];
const deep = (levels: number): unknown => (levels === 0 ? ['bottom'] : levels % 2 ? { a: deep(levels - 1) } : [deep(levels - 1)]);

function junkValue(depth = 0): unknown {
  switch (rnd.int(depth > 2 ? 5 : 8)) {
    case 0:
    case 1:
      return rnd.pick(STRINGS);
    case 2:
      return rnd.pick(NUMBERS);
    case 3:
      return rnd.pick([true, false, null]);
    case 4:
      return rnd.pick(LONE);
    case 5:
      return Array.from({ length: rnd.int(4) }, () => junkValue(depth + 1));
    case 6:
      return Object.fromEntries(Array.from({ length: rnd.int(4) }, () => [rnd.pick(STRINGS).slice(0, 20), junkValue(depth + 1)]));
    default:
      return deep(1 + rnd.int(60));
  }
}

/** The field names a zod object schema knows (or none). */
function fieldsOf(schema: z.ZodType | undefined): string[] {
  const shape = (schema as unknown as { shape?: Record<string, unknown> } | undefined)?.shape;
  if (shape && typeof shape === 'object') return Object.keys(shape);
  const inner = (schema as unknown as { def?: { in?: z.ZodType; innerType?: z.ZodType; schema?: z.ZodType } } | undefined)?.def;
  return inner ? fieldsOf(inner.in ?? inner.innerType ?? inner.schema) : [];
}

const EXTRA_FIELDS = [
  'email',
  'password',
  'name',
  'roles',
  'version',
  'inputs',
  'comment',
  'reason',
  'body',
  'parentId',
  'spanId',
  'frequencyHz',
  'template',
  'copyOf',
  'design',
  'path',
  'values',
  'token',
  'disabled',
  'retired',
  'note',
  'mode',
  'pitchMm',
  '__proto__',
  'constructor',
];
const DESIGN_NUMBER_PATHS: string[] = (function paths(value: unknown, prefix = ''): string[] {
  if (typeof value === 'number') return [prefix];
  if (value && typeof value === 'object')
    return Object.entries(value as Record<string, unknown>).flatMap(([k, v]) => paths(v, prefix ? `${prefix}.${k}` : k));
  return [];
})(defaultDesign('corexy'));

/** A design document with one input set to something odd (reaches the engine's own checks). */
function oddDesign(): Record<string, unknown> {
  const doc = structuredClone(defaultDesign(rnd.pick(['corexy', 'hbot', 'cartesian'] as const))) as unknown as Record<string, unknown>;
  const path = rnd.pick(DESIGN_NUMBER_PATHS).split('.');
  let node = doc;
  for (const key of path.slice(0, -1)) node = (node[key] ?? {}) as Record<string, unknown>;
  node[path[path.length - 1]] = rnd.next() < 0.6 ? rnd.pick(NUMBERS) : junkValue(2);
  return { ...doc, name: rnd.next() < 0.1 ? rnd.pick(LONE) : 'Fuzzed stage' };
}

function jsonBody(route: ApiRoute): unknown {
  const roll = rnd.next();
  if (roll < 0.05) return junkValue();
  if ((route.path === '/api/designs' || route.path.startsWith('/api/calc')) && roll < 0.12) {
    const design = oddDesign();
    if (route.path === '/api/designs') return design;
    return route.path.endsWith('sweep')
      ? { design, path: rnd.pick(DESIGN_NUMBER_PATHS), values: [rnd.pick(NUMBERS), rnd.pick(NUMBERS)] }
      : { design };
  }
  const known = fieldsOf(route.schemas.body);
  const names = [...known.filter(() => rnd.next() < 0.7), ...Array.from({ length: rnd.int(2) }, () => rnd.pick(EXTRA_FIELDS))];
  return Object.fromEntries(names.map((n) => [n, junkValue()]));
}

/** Ids: this file's own rows, unknown ones and malformed ones; never a row of another test file. */
function idFor(route: ApiRoute, param: string): string {
  const roll = rnd.next();
  if (roll < 0.45) {
    if (param === 'measurementId') return '987654321';
    if (route.path.startsWith('/api/users')) return String(own.user);
    if (route.path.startsWith('/api/sheets')) return String(own.sheet);
    if (route.path.startsWith('/api/parts')) return String(own.part);
    if (route.path.startsWith('/api/revisions')) return String(rnd.next() < 0.5 ? own.revision : own.reviewRevision);
    if (route.path.startsWith('/api/designs')) return String(own.design);
    return '987654321';
  }
  return rnd.pick([
    '987654321',
    'abc',
    '-1',
    '0',
    '1e3',
    '1.5',
    '0x10',
    '%00',
    '%E0%A4%A',
    '99999999999999999999',
    '%F0%9F%9B%A0',
    '..%2F..',
    '%20',
    'null',
    '%ED%A0%80',
  ]);
}

function queryFor(route: ApiRoute): string {
  if (rnd.next() < 0.4) return '';
  const keys = [...fieldsOf(route.schemas.query), 'page', 'pageSize', 'q', 'sort', 'status', 'paper', rnd.pick(STRINGS).slice(0, 10)];
  const parts = Array.from({ length: 1 + rnd.int(4) }, () => {
    const value = rnd.next() < 0.5 ? String(rnd.pick(NUMBERS)) : String(rnd.pick(STRINGS)).slice(0, 300);
    return `${encodeURIComponent(rnd.pick(keys).replace(/[\ud800-\udfff]/g, 'x'))}=${rnd.next() < 0.1 ? '%E0%A4%A' : encodeURIComponent(value.replace(/[\ud800-\udfff]/g, 'x'))}`;
  });
  return `?${parts.join('&')}`;
}

type Planned = { method: string; url: string; headers: Record<string, string>; body?: string | Buffer; label: string };

const MULTIPART_JUNK = [
  () => ({ type: 'multipart/form-data', body: '--x\r\nno boundary declared\r\n' }),
  () => ({
    type: 'multipart/form-data; boundary=zz',
    body: '--zz\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\nrpm,torque\r\n1',
  }),
  () => ({ type: 'multipart/form-data; boundary=zz', body: '--zz\r\nContent-Disposition form-data\r\n\r\nx\r\n--zz--\r\n' }),
  () => ({
    type: 'multipart/form-data; boundary=zz',
    body: `--zz\r\nContent-Disposition: form-data; name="spanId"\r\n\r\n${rnd.pick(STRINGS).slice(0, 50)}\r\n--zz\r\nContent-Disposition: form-data; name="file"; filename="${rnd.pick(['p.wav', 'a.csv', 'x.pdf', 'noext'])}"\r\nContent-Type: ${rnd.pick(['audio/wav', 'text/csv', 'application/pdf', 'image/png'])}\r\n\r\n${rnd.pick(['RIFF\u0000\u0000\u0000\u0000WAVEfmt ', 'rpm,torque\n100,0.4\n200,x', '%PDF-1.4 junk', '\u0089PNG'])}\r\n--zz--\r\n`,
  }),
];
const RAW_BODIES = [
  'null',
  '[]',
  '{',
  '{"a":1}}',
  '"text"',
  '12',
  '1e99999',
  '{"__proto__":{"polluted":true}}',
  '\u0000',
  `{"name":"\\ud800"}`,
];

function plan(route: ApiRoute): Planned {
  const ids: Record<string, string> = {};
  for (const param of route.path.match(/:(\w+)/g) ?? []) ids[param.slice(1)] = idFor(route, param.slice(1));
  const path = fillPath(route.path, '1', ids);
  const endsOwnSession = route.path === '/api/auth/logout' || route.path.startsWith('/api/auth/sessions');
  const who =
    endsOwnSession && route.method !== 'get' ? 'anonymous' : rnd.next() < 0.8 ? 'admin' : rnd.pick(['noRole', 'anonymous'] as const);
  const headers: Record<string, string> = {
    'X-Forwarded-For': `198.18.${rnd.int(256)}.${1 + rnd.int(254)}`,
    ...(who === 'anonymous' ? {} : { Cookie: cookies[who] }),
  };
  if (rnd.next() < 0.02) headers.Origin = rnd.pick(['https://attacker.example', 'null']);
  const planned: Planned = {
    method: route.method.toUpperCase(),
    url: `${base}${path}${queryFor(route)}`,
    headers,
    label: routeLabel(route),
  };
  if (route.method === 'get' || route.method === 'delete') {
    // (fetch sends no body with GET.)
    if (route.method === 'delete' && rnd.next() < 0.1)
      Object.assign(planned, { body: JSON.stringify(junkValue()), headers: { ...headers, 'Content-Type': 'application/json' } });
    return planned;
  }
  const roll = rnd.next();
  if (route.isUpload && roll < 0.45) {
    const { type, body } = rnd.pick(MULTIPART_JUNK)();
    return { ...planned, body, headers: { ...headers, 'Content-Type': type } };
  }
  if (roll < 0.12) return { ...planned, body: rnd.pick(RAW_BODIES), headers: { ...headers, 'Content-Type': 'application/json' } };
  if (roll < 0.17)
    return {
      ...planned,
      body: 'a=1&b=2',
      headers: { ...headers, 'Content-Type': rnd.pick(['text/plain', 'application/x-www-form-urlencoded', 'application/xml']) },
    };
  if (roll < 0.2)
    return {
      ...planned,
      body: '\u001f\u008b junk',
      headers: { ...headers, 'Content-Type': 'application/json', 'Content-Encoding': rnd.pick(['gzip', 'deflate', 'br', 'x-unknown']) },
    };
  if (roll < 0.22) return { ...planned, body: '{"a":1}', headers: { ...headers, 'Content-Type': 'application/json; charset=latin-9' } };
  if (roll < 0.25) return planned; // no body at all
  return { ...planned, body: JSON.stringify(jsonBody(route)), headers: { ...headers, 'Content-Type': 'application/json' } };
}

// ---------------------------------------------------------------------------------------------------------------

describe('fuzz sweep over the real router', () => {
  it(`when ${REQUESTS} generated requests hit every route, then none answers 5xx and every error has the usual shape (seed ${SEED})`, async () => {
    // Arrange
    const routes = walkRoutes();
    expect(routes.length).toBeGreaterThan(60);
    const failures: string[] = [];
    const badShapes: string[] = [];
    const perRoute = new Map<string, number>();
    let sent = 0;
    // Act
    const worker = async () => {
      for (;;) {
        const n = sent++;
        if (n >= REQUESTS) return;
        const p = plan(routes[n % routes.length]);
        perRoute.set(p.label, (perRoute.get(p.label) ?? 0) + 1);
        const res = await fetch(p.url, { method: p.method, headers: p.headers, body: p.body, redirect: 'manual' });
        const text = await res.text();
        if (res.status >= 500)
          failures.push(`${res.status} ${p.method} ${p.url} ${String(p.body ?? '').slice(0, 200)} → ${text.slice(0, 300)}`);
        else if (res.status >= 400) {
          try {
            const body = JSON.parse(text) as { error?: { code?: unknown; message?: unknown } };
            if (typeof body.error?.code !== 'string' || typeof body.error?.message !== 'string') throw new Error('shape');
          } catch {
            badShapes.push(`${res.status} ${p.method} ${p.url} → ${text.slice(0, 200)}`);
          }
        }
      }
    };
    await Promise.all(Array.from({ length: IN_FLIGHT }, worker));
    // Assert
    expect(sent).toBeGreaterThanOrEqual(REQUESTS);
    expect(failures.slice(0, 20)).toEqual([]);
    expect(badShapes.slice(0, 20)).toEqual([]);
    expect(perRoute.size).toBe(new Set(routes.map(routeLabel)).size);
  }, 600_000);
});
