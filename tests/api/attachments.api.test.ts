import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { Attachment, AuditLog } from '../../server/models';
import { createDesign, signedInAs, type Agent } from '../helpers/factories';

// Each test file stores uploads in its own folder, so counting files there is not disturbed by other files.
const UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-attachments-'));
process.env.UPLOAD_DIR = UPLOAD_DIR;
resetConfigCache();
const app = createApp();

type Who = 'owner' | 'otherDesigner' | 'admin' | 'maker' | 'reviewer' | 'anonymous';
const agents = {} as Record<Who, Agent>;
let ownerId: number;
let designId: number;

beforeAll(async () => {
  const owner = await signedInAs(app, ['designer']);
  agents.owner = owner.agent;
  ownerId = owner.user.id;
  agents.otherDesigner = (await signedInAs(app, ['designer'])).agent;
  agents.admin = (await signedInAs(app, ['admin'])).agent;
  agents.maker = (await signedInAs(app, ['maker'])).agent;
  agents.reviewer = (await signedInAs(app, ['reviewer'])).agent;
  agents.anonymous = request.agent(app);
  designId = (await createDesign({ owner: owner.user })).id;
});

afterAll(async () => {
  await closeSequelize();
  delete process.env.UPLOAD_DIR;
  resetConfigCache();
  fs.rmSync(UPLOAD_DIR, { recursive: true, force: true });
});

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
let counter = 0;
/** Distinct bytes each call, so tests never share content by accident. */
const unique = () => Buffer.from(`${Date.now()}-${++counter}-${Math.random()}`);

/** A file whose bytes start with the real signature of its type. */
const FILES = {
  png: () => Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.from('IHDR'), unique()]),
  pdf: () => Buffer.concat([Buffer.from('%PDF-1.7\n'), unique(), Buffer.from('\n%%EOF\n')]),
  jpeg: () => Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10]), Buffer.from('JFIF'), unique()]),
  csv: () => Buffer.from(`item,quantity\nidler,${counter++}\n`),
};

function storedFiles(): string[] {
  if (!fs.existsSync(UPLOAD_DIR)) return [];
  return (fs.readdirSync(UPLOAD_DIR, { recursive: true }) as string[])
    .map((p) => path.join(UPLOAD_DIR, p))
    .filter((p) => fs.statSync(p).isFile());
}

const isStored = (hash: string) => storedFiles().some((f) => path.basename(f) === hash);

function binary(res: request.Request): request.Request {
  return res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

function upload(who: Who, bytes: Buffer, filename: string, contentType?: string, id = designId): request.Test {
  return agents[who].post(`/api/designs/${id}/attachments`).attach('file', bytes, contentType ? { filename, contentType } : filename);
}

describe('POST /api/designs/:id/attachments', () => {
  it.each([
    ['PDF', FILES.pdf, 'motor-datasheet.pdf', 'application/pdf', 'application/pdf'],
    ['PNG', FILES.png, 'photo.png', 'image/png', 'image/png'],
    ['JPEG', FILES.jpeg, 'photo.jpeg', 'image/jpeg', 'image/jpeg'],
    ['CSV', FILES.csv, 'cut-list.csv', 'text/csv', 'text/csv; charset=utf-8'],
  ])(
    'when the owner attaches a %s, then 201, it is listed, stored under its SHA-256 and downloads byte for byte with safe headers',
    async (_kind, make, filename, declared, served) => {
      // Arrange
      const bytes = make();
      // Act
      const res = await upload('owner', bytes, filename, declared);
      const list = await agents.maker.get(`/api/designs/${designId}/attachments`);
      const download = await binary(agents.reviewer.get(`/api/attachments/${res.body.id}`));
      // Assert
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({
        designId,
        partId: null,
        fileName: filename,
        size: bytes.length,
        sha256: sha256(bytes),
        uploadedBy: { id: ownerId },
        canDelete: true,
        url: `/api/attachments/${res.body.id}`,
      });
      expect(list.status).toBe(200);
      expect(list.body.items.find((a: { id: number }) => a.id === res.body.id)).toMatchObject({ fileName: filename, canDelete: false });
      expect(list.body.canUpload).toBe(false);
      expect(isStored(sha256(bytes))).toBe(true);
      expect(download.status).toBe(200);
      expect(download.headers['content-type']).toBe(served);
      expect(download.headers['content-disposition']).toBe(`attachment; filename=${filename}`);
      expect(download.headers['x-content-type-options']).toBe('nosniff');
      expect(download.headers['content-security-policy']).toContain('sandbox');
      expect(sha256(download.body as Buffer)).toBe(sha256(bytes));
      expect(await AuditLog.count({ where: { action: 'attachment.create', entityId: res.body.id } })).toBe(1);
    },
  );

  it('when the client name carries a path and characters that are unsafe in a header, then only a sanitised last segment is kept', async () => {
    const res = await upload('owner', FILES.png(), '..\\..\\secret<1>|x?.png', 'image/png');
    const download = await agents.owner.get(`/api/attachments/${res.body.id}`);
    expect(res.status).toBe(201);
    expect(res.body.fileName).toBe('secret_1__x_.png');
    expect(download.headers['content-disposition']).toBe('attachment; filename=secret_1__x_.png');
  });

  it('when the name is not ASCII, then Content-Disposition carries an ASCII fallback and the UTF-8 name', async () => {
    const res = await upload('owner', FILES.pdf(), 'Motor Ω curve.pdf', 'application/pdf');
    const download = await agents.owner.get(`/api/attachments/${res.body.id}`);
    expect(res.body.fileName).toBe('Motor Ω curve.pdf');
    expect(download.headers['content-disposition']).toBe(
      `attachment; filename="Motor ? curve.pdf"; filename*=UTF-8''Motor%20%CE%A9%20curve.pdf`,
    );
  });

  it("when an admin attaches to someone else's design, then 201; the admin lists with canUpload", async () => {
    const res = await upload('admin', FILES.csv(), 'bom.csv', 'text/csv');
    const list = await agents.admin.get(`/api/designs/${designId}/attachments`);
    expect(res.status).toBe(201);
    expect(list.body.canUpload).toBe(true);
    expect(list.body.items.every((a: { canDelete: boolean }) => a.canDelete)).toBe(true);
  });

  it.each([
    ['another designer', 403, 'otherDesigner'],
    ['a maker', 403, 'maker'],
    ['a reviewer', 403, 'reviewer'],
    ['nobody signed in', 401, 'anonymous'],
  ] as const)('when %s attaches to the design, then %i and nothing is stored', async (_who, status, who) => {
    const files = storedFiles().length;
    const rows = await Attachment.count({ where: { designId } });
    const res = await upload(who, FILES.png(), 'p.png', 'image/png');
    expect(res.status).toBe(status);
    expect(storedFiles().length).toBe(files);
    expect(await Attachment.count({ where: { designId } })).toBe(rows);
  });

  it.each([
    ['PNG bytes named .pdf', FILES.png, 'drawing.pdf', 'application/pdf'],
    ['PNG bytes declared as application/pdf', FILES.png, 'drawing', 'application/pdf'],
    ['PDF bytes named .png', FILES.pdf, 'photo.png', 'image/png'],
    ['text named .png', FILES.csv, 'photo.png', 'image/png'],
    ['a GIF', () => Buffer.concat([Buffer.from('GIF89a'), Buffer.from([1, 0, 1, 0, 0, 0, 0]), unique()]), 'anim.gif', 'image/gif'],
    [
      'a WAV (not a design attachment type)',
      () => Buffer.concat([Buffer.from('RIFF'), Buffer.alloc(4), Buffer.from('WAVEfmt '), unique()]),
      'pluck.wav',
      'audio/wav',
    ],
    ['binary junk', () => Buffer.from([0, 1, 2, 3, 250, 251, 252, 0, 0, 9]), 'data.bin', 'application/octet-stream'],
    ['an empty file', () => Buffer.alloc(0), 'empty.pdf', 'application/pdf'],
  ])('when the file is %s, then 415 and nothing is stored', async (_what, make, filename, declared) => {
    const files = storedFiles().length;
    const rows = await Attachment.count({ where: { designId } });
    const res = await upload('owner', make(), filename, declared);
    expect(res.status).toBe(415);
    expect(res.body.error.code).toMatch(/unsupported_media_type|empty_file/);
    expect(res.body.error.message).toContain(filename.length ? filename : '');
    expect(storedFiles().length).toBe(files);
    expect(await Attachment.count({ where: { designId } })).toBe(rows);
  });

  it('when the file is larger than 10 MB, then 413 and nothing is stored', async () => {
    const files = storedFiles().length;
    const big = Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(10 * 1024 * 1024 + 10, 0x20)]);
    const res = await upload('owner', big, 'huge.pdf', 'application/pdf');
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({ code: 'payload_too_large', message: expect.stringContaining('10 MB') });
    expect(storedFiles().length).toBe(files);
  });

  it('when no file is sent, or two files, or an extra field, then 400 naming the field', async () => {
    const none = await agents.owner.post(`/api/designs/${designId}/attachments`).field('note', 'x');
    const empty = await agents.owner.post(`/api/designs/${designId}/attachments`).send({});
    const two = await agents.owner
      .post(`/api/designs/${designId}/attachments`)
      .attach('file', FILES.png(), 'a.png')
      .attach('file', FILES.png(), 'b.png');
    const wrongField = await agents.owner.post(`/api/designs/${designId}/attachments`).attach('upload', FILES.png(), 'a.png');
    expect(none.status).toBe(400);
    expect(none.body.error.details[0].path).toBe('note');
    expect(empty.status).toBe(400);
    expect(empty.body.error.details[0].path).toBe('file');
    expect(two.status).toBe(400);
    expect(two.body.error.code).toBe('invalid_upload');
    expect(wrongField.status).toBe(400);
    expect(wrongField.body.error.details[0].path).toBe('upload');
  });

  it('when the design does not exist, then 404 for upload and list', async () => {
    const up = await upload('admin', FILES.png(), 'p.png', 'image/png', 987654321);
    const list = await agents.admin.get('/api/designs/987654321/attachments');
    expect(up.status).toBe(404);
    expect(list.status).toBe(404);
  });
});

describe('DELETE /api/attachments/:id', () => {
  it('when two attachments share the same bytes, then deleting one keeps the bytes and deleting the last removes them', async () => {
    // Arrange
    const bytes = FILES.pdf();
    const first = await upload('owner', bytes, 'a.pdf', 'application/pdf');
    const second = await upload('owner', bytes, 'copy of a.pdf', 'application/pdf');
    expect(first.body.sha256).toBe(second.body.sha256);
    // Act + Assert
    const del1 = await agents.owner.delete(`/api/attachments/${first.body.id}`);
    expect(del1.status).toBe(204);
    expect(isStored(sha256(bytes))).toBe(true);
    expect((await agents.owner.get(`/api/attachments/${first.body.id}`)).status).toBe(404);
    expect((await binary(agents.owner.get(`/api/attachments/${second.body.id}`))).status).toBe(200);
    const del2 = await agents.owner.delete(`/api/attachments/${second.body.id}`);
    expect(del2.status).toBe(204);
    expect(isStored(sha256(bytes))).toBe(false);
    const list = await agents.owner.get(`/api/designs/${designId}/attachments`);
    expect(list.body.items.map((a: { id: number }) => a.id)).not.toContain(second.body.id);
    expect(await AuditLog.count({ where: { action: 'attachment.delete', entityId: second.body.id } })).toBe(1);
  });

  it.each([
    ['another designer', 403, 'otherDesigner'],
    ['a maker', 403, 'maker'],
    ['nobody signed in', 401, 'anonymous'],
  ] as const)("when %s deletes the owner's attachment, then %i and it stays", async (_who, status, who) => {
    const bytes = FILES.png();
    const created = await upload('owner', bytes, 'keep.png', 'image/png');
    const res = await agents[who].delete(`/api/attachments/${created.body.id}`);
    expect(res.status).toBe(status);
    expect((await binary(agents.owner.get(`/api/attachments/${created.body.id}`))).status).toBe(200);
    expect(isStored(sha256(bytes))).toBe(true);
  });

  it("when an admin deletes the owner's attachment, then 204", async () => {
    const created = await upload('owner', FILES.png(), 'gone.png', 'image/png');
    expect((await agents.admin.delete(`/api/attachments/${created.body.id}`)).status).toBe(204);
  });

  it('when the attachment does not exist or the id is not a number, then 404 / 400', async () => {
    expect((await agents.admin.delete('/api/attachments/987654321')).status).toBe(404);
    expect((await agents.admin.get('/api/attachments/987654321')).status).toBe(404);
    const bad = await agents.admin.get('/api/attachments/..%2F..%2Fetc%2Fpasswd');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('id');
  });
});

describe('DELETE /api/designs/:id (its attachments)', () => {
  it('when a draft with attachments is deleted, then its rows go and only bytes nothing else refers to are removed', async () => {
    // Arrange: the doomed design has its own file and one it shares with another design.
    const owner = (await agents.owner.get('/api/auth/me')).body.user;
    const doomed = await createDesign({ owner, name: 'Doomed draft' });
    const own = FILES.png();
    const shared = FILES.pdf();
    const ownRes = await upload('owner', own, 'own.png', 'image/png', doomed.id);
    const sharedRes = await upload('owner', shared, 'shared.pdf', 'application/pdf', doomed.id);
    const keeper = await upload('owner', shared, 'shared copy.pdf', 'application/pdf', designId);
    expect([ownRes.status, sharedRes.status, keeper.status]).toEqual([201, 201, 201]);
    expect(isStored(sha256(own))).toBe(true);
    // Act
    const res = await agents.owner.delete(`/api/designs/${doomed.id}`);
    // Assert
    expect(res.status).toBe(204);
    expect(await Attachment.count({ where: { designId: doomed.id } })).toBe(0);
    expect(isStored(sha256(own))).toBe(false);
    expect(isStored(sha256(shared))).toBe(true);
    const download = await binary(agents.owner.get(`/api/attachments/${keeper.body.id}`));
    expect(download.status).toBe(200);
    expect(sha256(download.body as Buffer)).toBe(sha256(shared));
  });
});
