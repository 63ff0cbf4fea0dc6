import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { Attachment, AuditLog, Design, Revision, type Role } from '../../server/models';
import type { PublicUser } from '../../server/services/users.service';
import { createDesign, signedInAs, type Agent } from '../helpers/factories';

// Uploads of this file go to their own folder.
const UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-job-'));
process.env.UPLOAD_DIR = UPLOAD_DIR;
resetConfigCache();
const app = createApp();

type Who = 'owner' | 'otherDesigner' | 'reviewer' | 'maker' | 'admin' | 'anonymous';
const agents = {} as Record<Who, Agent>;
const users = {} as Record<Exclude<Who, 'anonymous'>, PublicUser>;

beforeAll(async () => {
  const roles: Record<Exclude<Who, 'anonymous'>, Role[]> = {
    owner: ['designer'],
    otherDesigner: ['designer'],
    reviewer: ['reviewer'],
    maker: ['maker'],
    admin: ['admin'],
  };
  for (const who of Object.keys(roles) as Exclude<Who, 'anonymous'>[]) {
    const signed = await signedInAs(app, roles[who]);
    agents[who] = signed.agent;
    users[who] = signed.user;
  }
  agents.anonymous = request.agent(app);
});

afterAll(async () => {
  await closeSequelize();
  delete process.env.UPLOAD_DIR;
  resetConfigCache();
  fs.rmSync(UPLOAD_DIR, { recursive: true, force: true });
});

const CSV = 'x_mm,y_mm,dwell_s\n10,10,0.2\n120,40,0.2\n60,200,0\n';

const post = (
  who: Who,
  id: number,
  csv: string | Buffer,
  version: number | string | null,
  filename = 'job.csv',
  contentType = 'text/csv',
) => {
  const req = agents[who].post(`/api/designs/${id}/job`);
  if (version !== null) req.field('version', String(version));
  return req.attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv), { filename, contentType });
};

async function storedInputs(id: number): Promise<Record<string, unknown>> {
  const row = await Design.findByPk(id);
  return (typeof row!.inputs === 'string' ? JSON.parse(row!.inputs) : row!.inputs) as Record<string, unknown>;
}

describe('POST /api/designs/:id/job', () => {
  it('when the owner uploads a job file, then 200, the points are saved in the design (version + 1), the file is kept and the upload audited', async () => {
    // Arrange
    const design = await createDesign({ owner: users.owner });
    // Act
    const res = await post('owner', design.id, CSV, design.version, 'placer job.csv');
    const read = await agents.reviewer.get(`/api/designs/${design.id}`);
    // Assert
    const points = [
      { xMm: 10, yMm: 10, dwellS: 0.2 },
      { xMm: 120, yMm: 40, dwellS: 0.2 },
      { xMm: 60, yMm: 200, dwellS: 0 },
    ];
    expect(res.status).toBe(200);
    expect(res.body.job).toEqual({ pointCount: 3, sourceUnits: { x: 'mm', y: 'mm', dwell: 's' } });
    expect(res.body.design).toMatchObject({ id: design.id, version: design.version + 1, inputs: { job: { points } } });
    expect(res.body.file).toMatchObject({ designId: design.id, fileName: 'placer job.csv', mime: 'text/csv', size: CSV.length });
    expect(read.body.inputs.job).toEqual({ points });
    expect((await storedInputs(design.id)).job).toEqual({ points });
    expect(await Attachment.count({ where: { designId: design.id } })).toBe(1);
    const audit = await AuditLog.findOne({ where: { entity: 'design', entityId: design.id, action: 'design.job_upload' } });
    expect(audit?.reason).toMatch(/^placer job\.csv: 3 points \(x mm, y mm, dwell s\), SHA-256 [0-9a-f]{64}$/);
  });

  it('when the job is in inches, then the saved points are in mm', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await post('owner', design.id, 'x (in),y (in)\n1,2\n3,4\n', design.version);
    expect(res.status).toBe(200);
    expect((await storedInputs(design.id)).job).toEqual({
      points: [
        { xMm: 25.4, yMm: 50.8, dwellS: 0 },
        { xMm: 76.2, yMm: 101.6, dwellS: 0 },
      ],
    });
  });

  it('when the job was uploaded and the design submitted, then the revision freezes the points', async () => {
    // Arrange
    const design = await createDesign({ owner: users.owner });
    await post('owner', design.id, CSV, design.version);
    // Act
    const submit = await agents.owner.post(`/api/designs/${design.id}/submit`).send({});
    // Assert
    expect(submit.status).toBe(201);
    const revision = await Revision.findOne({ where: { designId: design.id } });
    const inputs = (typeof revision!.inputs === 'string' ? JSON.parse(revision!.inputs) : revision!.inputs) as {
      job: { points: unknown[] };
    };
    expect(inputs.job.points).toHaveLength(3);
  });

  it('when the file has bad rows, then 400 invalid_csv names every line and column and the design is unchanged', async () => {
    // Arrange
    const design = await createDesign({ owner: users.owner });
    // Act
    const res = await post('owner', design.id, 'x,y,dwell\n1,2,0\nabc,2,0\n1,2,-3\n', design.version);
    // Assert
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_csv');
    expect(res.body.error.details).toEqual([
      { path: 'file · line 3 · x', message: '"abc" is not a number', line: 3, column: 'x' },
      { path: 'file · line 4 · dwell', message: 'dwell must be between 0 and 3600 s (found -3)', line: 4, column: 'dwell' },
    ]);
    const row = await Design.findByPk(design.id);
    expect(row!.version).toBe(design.version);
    expect((await storedInputs(design.id)).job).toBeNull();
    expect(await Attachment.count({ where: { designId: design.id } })).toBe(0);
  });

  it('when the version is stale, then 409 version_conflict and nothing is stored', async () => {
    // Arrange
    const design = await createDesign({ owner: users.owner });
    await agents.owner.patch(`/api/designs/${design.id}`).send({ name: 'Renamed', version: design.version });
    // Act
    const res = await post('owner', design.id, CSV, design.version);
    // Assert
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('version_conflict');
    expect(await Attachment.count({ where: { designId: design.id } })).toBe(0);
  });

  it('when the version is missing, then 400 naming version', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await post('owner', design.id, CSV, null);
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain('version');
  });

  it('when no file is sent, then 400 naming file', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await agents.owner.post(`/api/designs/${design.id}/job`).field('version', String(design.version));
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'file', message: 'is required (multipart field "file")' }]);
  });

  it('when the file is not text, then 415', async () => {
    const design = await createDesign({ owner: users.owner });
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
    const res = await post('owner', design.id, png, design.version, 'job.csv', 'text/csv');
    expect(res.status).toBe(415);
  });

  it('when the file is larger than 64 kB, then 413', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await post('owner', design.id, `x,y\n${'1,2\n'.repeat(20000)}`, design.version);
    expect(res.status).toBe(413);
  });

  it('when the design is in review, then 409 not_editable', async () => {
    const design = await createDesign({ owner: users.owner, status: 'in_review' });
    const res = await post('owner', design.id, CSV, design.version);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('not_editable');
  });

  it.each([
    ['otherDesigner', 403],
    ['reviewer', 403],
    ['maker', 403],
    ['anonymous', 401],
  ] as const)('when %s uploads to the owner’s draft, then %i and the draft is unchanged', async (who, status) => {
    const design = await createDesign({ owner: users.owner });
    const res = await post(who, design.id, CSV, design.version);
    expect(res.status).toBe(status);
    expect((await storedInputs(design.id)).job).toBeNull();
  });

  it('when an admin uploads to someone’s draft, then 200', async () => {
    const design = await createDesign({ owner: users.owner });
    const res = await post('admin', design.id, CSV, design.version);
    expect(res.status).toBe(200);
  });

  it('when the design does not exist, then 404', async () => {
    const res = await post('owner', 2_000_000_000, CSV, 1);
    expect(res.status).toBe(404);
  });

  it('when the id is not a number, then 400', async () => {
    const res = await agents.owner.post('/api/designs/abc/job').field('version', '1');
    expect(res.status).toBe(400);
  });
});

describe('PATCH /api/designs/:id with inputs.job', () => {
  it('when typed points have a bad dwell, then 400 naming inputs.job.points.1.dwellS', async () => {
    // Arrange
    const design = await createDesign({ owner: users.owner });
    const inputs = {
      ...design.inputs,
      job: {
        points: [
          { xMm: 1, yMm: 1 },
          { xMm: 2, yMm: 2, dwellS: -1 },
        ],
      },
    };
    // Act
    const res = await agents.owner.patch(`/api/designs/${design.id}`).send({ inputs, version: design.version });
    // Assert
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'inputs.job.points.1.dwellS', message: 'job point dwell must be at least 0' }]);
  });
});
