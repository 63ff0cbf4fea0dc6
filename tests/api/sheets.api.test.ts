import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize, getSequelize } from '../../server/db';
import { Design, Sheet, type Role } from '../../server/models';
import type { PublicUser } from '../../server/services/users.service';
import { getContentStore } from '../../server/storage';
import { createDesign, signedInAs, type Agent } from '../helpers/factories';

// Each approval renders the sheet in A4 and US Letter (a few seconds each on a busy machine).
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

const app = createApp();
let dir: string;
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  await closeSequelize();
});

type Who = 'owner' | 'otherDesigner' | 'reviewer' | 'admin' | 'maker' | 'noRole';
const agents = {} as Record<Who, Agent>;
const users = {} as Record<Who, PublicUser>;
let anonymous: Agent;

/** Binary body parser for supertest: the PDF as a Buffer (at run time `res` is the response stream). */
function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void): void {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (chunk: Buffer) => chunks.push(Buffer.from(chunk)));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

function pdfText(bytes: Buffer): string {
  const file = path.join(dir, `${sha256(bytes)}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

// One design taken through two approvals: revision 1 (its sheet later superseded) and revision 2.
let designId: number;
let designName: string;
let first: {
  revisionId: number;
  sheet: { id: number; sha256: string; files: { paper: string; sha256: string; size: number; fileName: string }[] };
};
let second: { revisionId: number; sheet: { id: number; sha256: string } };
let firstPdf: Buffer;

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'gw-sheets-api-'));
  const roles: Record<Who, Role[]> = {
    owner: ['designer'],
    otherDesigner: ['designer'],
    reviewer: ['reviewer'],
    admin: ['admin'],
    maker: ['maker'],
    noRole: [],
  };
  for (const who of Object.keys(roles) as Who[]) {
    const signed = await signedInAs(app, roles[who]);
    agents[who] = signed.agent;
    users[who] = signed.user;
  }
  anonymous = request.agent(app);

  const design = await createDesign({ owner: users.owner, name: `Sheet stage ${Date.now().toString(36)}` });
  designId = design.id;
  designName = design.name;
  const sub = await agents.owner.post(`/api/designs/${designId}/submit`).send({});
  const approved = await agents.reviewer.post(`/api/revisions/${sub.body.id}/approve`).send({ comment: 'First batch.' });
  if (approved.status !== 200) throw new Error(`approve failed: ${approved.status} ${JSON.stringify(approved.body)}`);
  first = { revisionId: sub.body.id, sheet: approved.body.sheet };
  firstPdf = (await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf`).buffer(true).parse(binary)).body as Buffer;
});

describe('GET /api/sheets/:id/pdf', () => {
  it('when a maker downloads the sheet, then the bytes are a PDF whose SHA-256 equals the stored one, with filename, type and hash headers', async () => {
    // Act
    const res = await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf`).buffer(true).parse(binary);
    const bytes = res.body as Buffer;
    const stored = await Sheet.findByPk(first.sheet.id);

    // Assert
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${first.sheet.files[0].fileName}"`);
    expect(first.sheet.files[0].fileName).toMatch(/^sheet-stage-[a-z0-9]+-rev1\.pdf$/);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(sha256(bytes)).toBe(stored!.a4Sha256);
    expect(sha256(bytes)).toBe(first.sheet.sha256);
    expect(res.headers['x-content-sha256']).toBe(first.sheet.sha256);
    expect(res.headers.etag).toBe(`"${first.sheet.sha256}"`);
    expect(Number(res.headers['content-length'])).toBe(bytes.length);
    expect(stored!.a4Pdf).toBeNull(); // the bytes live in the content store, under their SHA-256
    expect(bytes.equals(await getContentStore().get(stored!.a4Sha256, { verify: true }))).toBe(true);
  });

  it('when the text is read back, then it names the frozen design, revision and approval', () => {
    const text = pdfText(firstPdf);
    expect(text).toContain(designName);
    expect(text).toContain('Revision 1');
    expect(text).toContain(users.reviewer.name);
    expect(text).toContain('First batch.');
  });

  it('when the Letter paper is asked for, then other stored bytes with their own hash and a -letter filename', async () => {
    const res = await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf?paper=letter`).buffer(true).parse(binary);
    const letter = first.sheet.files.find((f) => f.paper === 'LETTER')!;

    expect(res.status).toBe(200);
    expect(sha256(res.body as Buffer)).toBe(letter.sha256);
    expect(letter.sha256).not.toBe(first.sheet.sha256);
    expect(res.headers['content-disposition']).toContain('-rev1-letter.pdf');
    expect((res.body as Buffer).toString('latin1')).toMatch(/\/MediaBox \[0 0 612 792\]/);
    expect(firstPdf.toString('latin1')).toMatch(/\/MediaBox \[0 0 595\.2\d* 841\.8\d*\]/);
  });

  it('when the browser already has these bytes (If-None-Match), then 304 without a body', async () => {
    const res = await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf`).set('If-None-Match', `"${first.sheet.sha256}"`);
    expect(res.status).toBe(304);
  });

  it('when the paper is unknown, the sheet missing or the id bad, then 400, 404, 400', async () => {
    const paper = await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf?paper=a3`);
    const missing = await agents.maker.get('/api/sheets/2147483000/pdf');
    const bad = await agents.maker.get('/api/sheets/1e3/pdf');
    expect(paper.status).toBe(400);
    expect(paper.body.error.details).toEqual([{ path: 'paper', message: 'must be a4 or letter' }]);
    expect(missing.status).toBe(404);
    expect(bad.status).toBe(400);
  });

  it.each([
    ['maker', 200],
    ['owner', 200],
    ['otherDesigner', 200],
    ['reviewer', 200],
    ['admin', 200],
    ['noRole', 403],
  ] as const)('when %s downloads, then %i', async (who, status) => {
    const res = await agents[who].get(`/api/sheets/${first.sheet.id}/pdf`);
    expect(res.status).toBe(status);
  });

  it('when signed out, then 401 for the list, the sheet and the PDF', async () => {
    expect((await anonymous.get('/api/sheets')).status).toBe(401);
    expect((await anonymous.get(`/api/sheets/${first.sheet.id}`)).status).toBe(401);
    expect((await anonymous.get(`/api/sheets/${first.sheet.id}/pdf`)).status).toBe(401);
  });
});

describe('a later revision of the same design', () => {
  beforeAll(async () => {
    // Reopen the approved design, change it, submit and approve revision 2.
    const reopen = await agents.owner.post(`/api/designs/${designId}/reopen`).send({});
    if (reopen.status !== 200) throw new Error(`reopen failed: ${reopen.status} ${JSON.stringify(reopen.body)}`);
    const current = await agents.owner.get(`/api/designs/${designId}`);
    // More pretension loads the motor shafts more: a motor with a stouter shaft keeps revision 2 free of failed checks
    // (approving over one needs a justification, tested in review.api.test.ts).
    const inputs = {
      ...current.body.inputs,
      name: `${designName} mk2`,
      pretensionN: current.body.inputs.pretensionN + 10,
      radialLoadRating: { ...current.body.inputs.radialLoadRating, motorShaftN: 150 },
    };
    const saved = await agents.owner.patch(`/api/designs/${designId}`).send({ inputs, version: current.body.version });
    const sub = await agents.owner.post(`/api/designs/${designId}/submit`).send({ version: saved.body.version });
    const approved = await agents.reviewer.post(`/api/revisions/${sub.body.id}/approve`).send({ comment: 'Second batch.' });
    if (approved.status !== 200) throw new Error(`second approve failed: ${approved.status} ${JSON.stringify(approved.body)}`);
    second = { revisionId: sub.body.id, sheet: approved.body.sheet };
  });

  it('when the sheets are listed, then both are there and the earlier one is marked superseded by the later', async () => {
    const res = await agents.maker.get(`/api/sheets?designId=${designId}`);

    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect(res.body.items.map((s: { id: number }) => s.id)).toEqual([second.sheet.id, first.sheet.id]);
    expect(res.body.items[0]).toMatchObject({
      revisionNumber: 2,
      isSuperseded: false,
      supersededBy: null,
      design: { id: designId, name: `${designName} mk2` },
    });
    expect(res.body.items[1]).toMatchObject({
      revisionNumber: 1,
      isSuperseded: true,
      supersededBy: { sheetId: second.sheet.id, revisionNumber: 2 },
      design: { id: designId, name: designName },
      approvedBy: { id: users.reviewer.id, name: users.reviewer.name },
      designer: { id: users.owner.id },
      comment: 'First batch.',
    });
    expect(res.body.items[1]).not.toHaveProperty('a4Pdf');
  });

  it('when only current sheets are asked for, then the superseded one is left out', async () => {
    const res = await agents.maker.get(`/api/sheets?designId=${designId}&current=true`);
    expect(res.body.items.map((s: { id: number }) => s.id)).toEqual([second.sheet.id]);
  });

  it('when the design changed after approval, then the earlier sheet still serves its original bytes and frozen name', async () => {
    const again = await agents.maker.get(`/api/sheets/${first.sheet.id}/pdf`).buffer(true).parse(binary);
    const detail = await agents.maker.get(`/api/sheets/${first.sheet.id}`);

    expect((again.body as Buffer).equals(firstPdf)).toBe(true);
    expect(detail.body.design.name).toBe(designName);
    expect(pdfText(firstPdf)).not.toContain(`${designName} mk2`);
  });

  it('when a maker opens the later sheet, then it shows the build figures of its own revision', async () => {
    const res = await agents.maker.get(`/api/sheets/${second.sheet.id}`);
    const revision = await agents.maker.get(`/api/revisions/${second.revisionId}`);

    expect(res.status).toBe(200);
    expect(res.body.build.pretensionN).toBe(revision.body.inputs.pretensionN);
    expect(res.body.build.stepsPerMm).toBe(revision.body.result.drive.stepsPerMm);
    expect(res.body.build.belts.length).toBe(revision.body.result.belts.length);
    expect(res.body.build.belts[0].spans[0].targetFrequencyHz).toBe(revision.body.result.belts[0].spans[0].targetFrequencyHz);
    expect(res.body.fingerprint).toBe(revision.body.fingerprint);
  });
});

describe('POST /api/designs/:id/reopen', () => {
  it('when a draft is reopened, then 409; when another designer reopens an approved design, then 403', async () => {
    const draft = await createDesign({ owner: users.owner });
    const approved = await createDesign({ owner: users.owner, status: 'approved' });

    const notApproved = await agents.owner.post(`/api/designs/${draft.id}/reopen`).send({});
    const stranger = await agents.otherDesigner.post(`/api/designs/${approved.id}/reopen`).send({});
    const maker = await agents.maker.post(`/api/designs/${approved.id}/reopen`).send({});

    expect(notApproved.status).toBe(409);
    expect(notApproved.body.error.message).toBe('This design is a draft; only an approved design can be reopened for a new revision.');
    expect(stranger.status).toBe(403);
    expect(maker.status).toBe(403);
    expect((await Design.findByPk(approved.id))?.status).toBe('approved');
  });
});

describe('immutability of sheets', () => {
  it.each(['put', 'patch', 'delete'] as const)(
    'when an admin sends %s to a sheet or its PDF, then 404 and the bytes are unchanged',
    async (method) => {
      const one = await agents.admin[method](`/api/sheets/${first.sheet.id}`).send({ comment: 'x' });
      const pdf = await agents.admin[method](`/api/sheets/${first.sheet.id}/pdf`).send({});
      const after = await Sheet.findByPk(first.sheet.id);

      expect([one.status, pdf.status]).toEqual([404, 404]);
      expect(after!.a4Sha256).toBe(first.sheet.sha256);
      expect(sha256(await getContentStore().get(after!.a4Sha256))).toBe(first.sheet.sha256);
    },
  );

  it('when the database is asked to update a sheet, then the trigger refuses it', async () => {
    const update = getSequelize().query("UPDATE sheets SET comment = 'forged' WHERE id = ?", { replacements: [first.sheet.id] });
    await expect(update).rejects.toThrow(/never changes/);
    expect((await Sheet.findByPk(first.sheet.id))?.comment).toBe('First batch.');
  });
});

describe('GET /api/sheets', () => {
  it.each([
    ['maker', 200],
    ['owner', 200],
    ['reviewer', 200],
    ['admin', 200],
    ['noRole', 403],
  ] as const)('when %s lists sheets, then %i', async (who, status) => {
    const res = await agents[who].get('/api/sheets?pageSize=5');
    expect(res.status).toBe(status);
    if (status === 200) {
      expect(res.body).toMatchObject({ page: 1, pageSize: 5 });
      expect(res.body.total).toBeGreaterThanOrEqual(2);
      const times = res.body.items.map((s: { approvedAt: string }) => Date.parse(s.approvedAt));
      expect(times).toEqual([...times].sort((a, b) => b - a));
    }
  });

  it('when the query is bad, then 400 naming the field', async () => {
    const res = await agents.maker.get('/api/sheets?current=maybe&page=0');
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['current', 'page']);
  });
});
