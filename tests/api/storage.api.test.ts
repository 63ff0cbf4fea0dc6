import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHash } from 'node:crypto';
import { ListObjectsV2Command, PutObjectCommand } from '@aws-sdk/client-s3';
import type request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize, getSequelize } from '../../server/db';
import { Attachment, AuditLog, Sheet } from '../../server/models';
import { storeWithRows } from '../../server/services/fileStore.service';
import {
  LocalContentStore,
  S3ContentStore,
  markUnreferenced,
  sweepOrphans,
  sweepStrays,
  useContentStore,
  type ContentStore,
} from '../../server/storage';
import { contentPath, ContentStoreError } from '../../server/uploads';
import { FAKE_S3_CREDENTIALS, startFakeS3, type FakeS3 } from '../../scripts/fakeS3';
import { createApprovedSheet, createDesign, createUser, signedInAs, type Agent } from '../helpers/factories';

// One suite, run against each back end of the content store: the local folder (the default) and an S3 bucket (a fake
// S3 service from the npm registry, started here). Content addressing, SHA-256 checks, size limits and "nothing saved
// on failure" must hold the same on both.

process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED = 'true';
const app = createApp();

type Backend = {
  store: ContentStore;
  /** Every stored hash. */
  listed: () => Promise<string[]>;
  /** Replaces the stored bytes of `sha256` with other bytes, behind the store's back. */
  tamper: (sha256: string, bytes: Buffer) => Promise<void>;
  close: () => Promise<void>;
};

const BACKENDS: Array<{ name: string; open: () => Promise<Backend> }> = [
  {
    name: 'local folder',
    open: async () => {
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-store-local-'));
      const store = new LocalContentStore(dir);
      return {
        store,
        listed: async () =>
          (fs.readdirSync(dir, { recursive: true }) as string[]).map((p) => path.basename(p)).filter((name) => /^[0-9a-f]{64}$/.test(name)),
        tamper: async (sha256, bytes) => fs.writeFileSync(contentPath(dir, sha256), bytes),
        close: async () => fs.rmSync(dir, { recursive: true, force: true }),
      };
    },
  },
  {
    name: 'S3 bucket (fake S3 service)',
    open: async () => {
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-store-s3-'));
      const fake: FakeS3 = await startFakeS3({ port: 0, dir, bucket: 'gw-storage-test' });
      const store = new S3ContentStore({
        bucket: fake.bucket,
        prefix: 'uploads',
        region: 'us-east-1',
        endpoint: fake.endpoint,
        forcePathStyle: true,
        credentials: FAKE_S3_CREDENTIALS,
      });
      return {
        store,
        listed: async () => {
          const res = await (await store.client()).send(new ListObjectsV2Command({ Bucket: fake.bucket, Prefix: 'uploads/' }));
          return (res.Contents ?? []).map((o) => path.posix.basename(o.Key ?? ''));
        },
        tamper: async (sha256, bytes) => {
          await (await store.client()).send(new PutObjectCommand({ Bucket: fake.bucket, Key: store.keyOf(sha256), Body: bytes }));
        },
        close: async () => {
          await fake.close();
          fs.rmSync(dir, { recursive: true, force: true });
        },
      };
    },
  },
];

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
let counter = 0;
const pdf = () =>
  Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.from(`${Date.now()}-${++counter}-${Math.random()}`), Buffer.from('\n%%EOF\n')]);

function binary(res: request.Request): request.Request {
  return res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

async function registryState(hash: string): Promise<string | null> {
  const rows = await getSequelize().query<{ state: string }>('SELECT state FROM stored_contents WHERE sha256 = ?', {
    replacements: [hash],
    type: QueryTypes.SELECT,
  });
  return rows[0]?.state ?? null;
}

afterAll(async () => {
  await closeSequelize();
});

describe.each(BACKENDS)('content store: $name', ({ name, open }) => {
  let backend: Backend;
  let restore: () => void;
  let owner: Agent;
  let ownerUser: Awaited<ReturnType<typeof signedInAs>>['user'];
  let designId: number;

  beforeAll(async () => {
    backend = await open();
    restore = useContentStore(backend.store);
    const signed = await signedInAs(app, ['designer']);
    owner = signed.agent;
    ownerUser = signed.user;
    designId = (await createDesign({ owner: signed.user })).id;
  });

  afterAll(async () => {
    restore();
    await backend.close();
  });

  const upload = (bytes: Buffer, name = 'datasheet.pdf', type = 'application/pdf') =>
    owner.post(`/api/designs/${designId}/attachments`).attach('file', bytes, { filename: name, contentType: type });

  it('when bytes are put, then they are named by their SHA-256 and read back byte for byte, twice without harm', async () => {
    // Arrange
    const bytes = pdf();
    // Act
    const first = await backend.store.put(bytes);
    const again = await backend.store.put(bytes);
    const read = await backend.store.get(first.sha256, { verify: true });
    // Assert
    expect(first).toEqual({
      sha256: sha256(bytes),
      relPath: `${sha256(bytes).slice(0, 2)}/${sha256(bytes).slice(2, 4)}/${sha256(bytes)}`,
      size: bytes.length,
    });
    expect(again).toEqual(first);
    expect(read.equals(bytes)).toBe(true);
    expect(await backend.store.has(first.sha256)).toBe(true);
    expect((await backend.listed()).filter((h) => h === first.sha256)).toHaveLength(1);
  });

  it.each(['../../etc/passwd', 'ABCDEF'.repeat(10) + 'abcd', 'a'.repeat(63), `${'a'.repeat(64)}/x`])(
    'when the address is %s, then it is refused as invalid_hash before the store is asked',
    async (address) => {
      // Act
      const outcomes = await Promise.all(
        [() => backend.store.get(address), () => backend.store.has(address), () => backend.store.remove(address)].map(
          (call: () => Promise<unknown>) =>
            Promise.resolve()
              .then(call)
              .then(
                () => null,
                (err: unknown) => err,
              ),
        ),
      );
      // Assert
      for (const outcome of outcomes) {
        expect(outcome).toBeInstanceOf(ContentStoreError);
        expect(outcome).toMatchObject({ code: 'invalid_hash', httpStatus: 400 });
      }
    },
  );

  it('when stored bytes were altered behind its back, then a verified read refuses them as corrupt and a download answers 500', async () => {
    // Arrange
    const bytes = pdf();
    const res = await upload(bytes);
    await backend.tamper(sha256(bytes), Buffer.from('%PDF-1.7\nsomething else entirely\n%%EOF\n'));
    // Act
    const read = await backend.store.get(sha256(bytes), { verify: true }).catch((err: unknown) => err);
    const download = await owner.get(`/api/attachments/${res.body.id}`);
    // Assert
    expect(read).toMatchObject({ code: 'corrupt' });
    expect(download.status).toBe(500);
  });

  // The sheet's SHA-256 check on read (issue 12, item 7) holds for PDFs in the store as for those in the row.
  it('when the stored PDF of a published sheet was altered, then it is not served: 500 sheet_integrity_failed and an audit entry', async () => {
    // Arrange
    const approver = await createUser({ roles: ['reviewer'] });
    const { agent: maker } = await signedInAs(app, ['maker']);
    const { sheetId } = await createApprovedSheet({ owner: ownerUser, approver: approver.user, inContentStore: true });
    const row = await Sheet.findByPk(sheetId);
    const intact = await binary(maker.get(`/api/sheets/${sheetId}/pdf`));
    // Act
    await backend.tamper(row!.a4Sha256, Buffer.from('%PDF-1.7\nswapped behind the store\n%%EOF\n'));
    const altered = await maker.get(`/api/sheets/${sheetId}/pdf`);
    // Assert
    expect(row!.a4Pdf).toBeNull();
    expect(intact.status).toBe(200);
    expect(sha256(intact.body as Buffer)).toBe(row!.a4Sha256);
    expect(altered.status).toBe(500);
    expect(altered.body.error.code).toBe('sheet_integrity_failed');
    const audit = await AuditLog.findOne({ where: { action: 'sheet.integrity_failed', entityId: sheetId } });
    expect(audit?.reason).toContain(row!.a4Sha256);
  });

  it('when content is missing, then a read says not_found and removing it says there was nothing', async () => {
    const missing = sha256(Buffer.from(`never stored ${Math.random()}`));
    await expect(backend.store.get(missing)).rejects.toMatchObject({ code: 'not_found', httpStatus: 404 });
    expect(await backend.store.has(missing)).toBe(false);
    expect(await backend.store.remove(missing)).toBe(false);
  });

  it('when a file is attached through the API, then it is stored under its SHA-256, registered in use and downloads byte for byte', async () => {
    // Arrange
    const bytes = pdf();
    // Act
    const res = await upload(bytes);
    const download = await binary(owner.get(`/api/attachments/${res.body.id}`));
    // Assert
    expect(res.status).toBe(201);
    expect(res.body.sha256).toBe(sha256(bytes));
    expect(await backend.listed()).toContain(sha256(bytes));
    expect(await registryState(sha256(bytes))).toBe('live');
    expect(download.status).toBe(200);
    expect((download.body as Buffer).equals(bytes)).toBe(true);
  });

  it('when the file is larger than the 10 MB limit, then 413 and nothing is stored', async () => {
    // Arrange
    const before = await backend.listed();
    const rows = await Attachment.count({ where: { designId } });
    const big = Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(10 * 1024 * 1024 + 1, 0x20)]);
    // Act
    const res = await upload(big, 'huge.pdf');
    // Assert
    expect(res.status).toBe(413);
    expect(await backend.listed()).toEqual(before);
    expect(await Attachment.count({ where: { designId } })).toBe(rows);
  });

  it('when the bytes are not of an accepted type, then 415 and nothing is stored', async () => {
    const before = await backend.listed();
    const res = await upload(Buffer.from('GIF89a\x01\x00\x01\x00 not a datasheet'), 'anim.gif', 'image/gif');
    expect(res.status).toBe(415);
    expect(await backend.listed()).toEqual(before);
  });

  it('when the store fails after the bytes landed, then the transaction rolls back and the bytes are removed again', async () => {
    // Arrange: a store whose put() stores the bytes and then fails, as a lost answer from the store would.
    const bytes = pdf();
    const failing: ContentStore = {
      kind: backend.store.kind,
      put: async (b) => {
        await backend.store.put(b);
        throw new Error('the store did not answer');
      },
      get: (h, o) => backend.store.get(h, o),
      has: (h) => backend.store.has(h),
      remove: (h) => backend.store.remove(h),
      list: (o) => backend.store.list(o),
    };
    const undo = useContentStore(failing);
    // Act
    let failure: unknown;
    try {
      await storeWithRows(bytes, (transaction) =>
        Attachment.create(
          {
            designId,
            partId: null,
            uploadedById: null,
            fileName: 'x.pdf',
            mime: 'application/pdf',
            size: bytes.length,
            sha256: sha256(bytes),
          },
          { transaction },
        ),
      );
    } catch (err) {
      failure = err;
    } finally {
      undo();
      useContentStore(backend.store);
    }
    // Assert
    expect((failure as Error).message).toBe('the store did not answer');
    expect(await Attachment.count({ where: { sha256: sha256(bytes) } })).toBe(0);
    expect(await backend.store.has(sha256(bytes))).toBe(false);
  });

  it('when two attachments share bytes, then deleting one keeps them and deleting the last removes them', async () => {
    // Arrange
    const bytes = pdf();
    const first = await upload(bytes, 'a.pdf');
    const second = await upload(bytes, 'copy.pdf');
    // Act
    const del1 = await owner.delete(`/api/attachments/${first.body.id}`);
    const keptAfterFirst = await backend.store.has(sha256(bytes));
    const del2 = await owner.delete(`/api/attachments/${second.body.id}`);
    // Assert
    expect([del1.status, del2.status]).toEqual([204, 204]);
    expect(keptAfterFirst).toBe(true);
    expect(await backend.store.has(sha256(bytes))).toBe(false);
    expect(await registryState(sha256(bytes))).toBeNull();
  });

  it('when another process holds the removal claim on the same bytes, then a new upload of them waits and finally answers 409 without saving', async () => {
    // Arrange: the bytes are orphaned and claimed by a remover whose lease has a minute left.
    const bytes = pdf();
    const hash = sha256(bytes);
    await backend.store.put(bytes);
    await getSequelize().query(
      "INSERT INTO stored_contents (sha256, size, state, orphan_since, claim_token, claimed_until, created_at, updated_at) VALUES (?, ?, 'removing', NOW(3), ?, DATE_ADD(NOW(3), INTERVAL 1 MINUTE), NOW(3), NOW(3))",
      { replacements: [hash, bytes.length, 'f'.repeat(32)] },
    );
    // Act
    const res = await upload(bytes);
    // Assert
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('write_conflict');
    expect(await Attachment.count({ where: { sha256: hash } })).toBe(0);
    expect(await registryState(hash)).toBe('removing');
  });

  it('when a remover crashed and its claim expired, then a new upload takes the bytes over and they stay', async () => {
    // Arrange
    const bytes = pdf();
    const hash = sha256(bytes);
    await getSequelize().query(
      "INSERT INTO stored_contents (sha256, size, state, orphan_since, claim_token, claimed_until, created_at, updated_at) VALUES (?, ?, 'removing', NOW(3), ?, DATE_SUB(NOW(3), INTERVAL 1 MINUTE), NOW(3), NOW(3))",
      { replacements: [hash, bytes.length, 'e'.repeat(32)] },
    );
    // Act
    const res = await upload(bytes);
    const swept = await sweepOrphans(backend.store, { minAgeMs: 60_000, limit: 1000 });
    // Assert
    expect(res.status).toBe(201);
    expect(await registryState(hash)).toBe('live');
    expect(swept).toBe(0);
    expect((await backend.store.get(hash, { verify: true })).equals(bytes)).toBe(true);
  });

  it('when bytes are orphaned and nothing refers to them, then the sweeper removes them; referenced bytes it leaves alone', async () => {
    // Arrange: one hash with no rows at all (a crashed delete), one still attached but wrongly marked orphan.
    const loose = pdf();
    const attached = pdf();
    await backend.store.put(loose);
    const res = await upload(attached);
    await getSequelize().query(
      "INSERT INTO stored_contents (sha256, size, state, orphan_since, created_at, updated_at) VALUES (?, ?, 'orphan', DATE_SUB(NOW(3), INTERVAL 10 MINUTE), NOW(3), NOW(3))",
      { replacements: [sha256(loose), loose.length] },
    );
    await getSequelize().query(
      "UPDATE stored_contents SET state = 'orphan', orphan_since = DATE_SUB(NOW(3), INTERVAL 10 MINUTE) WHERE sha256 = ?",
      {
        replacements: [sha256(attached)],
      },
    );
    // Act
    await sweepOrphans(backend.store, { minAgeMs: 60_000, limit: 1000 });
    // Assert
    expect(res.status).toBe(201);
    expect(await backend.store.has(sha256(loose))).toBe(false);
    expect(await registryState(sha256(loose))).toBeNull();
    expect(await backend.store.has(sha256(attached))).toBe(true);
    expect(await registryState(sha256(attached))).toBe('live');
    expect(await markUnreferenced(sha256(attached))).toBe(false);
  });

  it('when the store is listed page by page, then every stored hash comes once, in hash order, with when it was stored', async () => {
    // Arrange
    for (let i = 0; i < 3; i++) await backend.store.put(pdf());
    const stored = (await backend.listed()).sort();
    // Act
    const seen: string[] = [];
    let after: string | undefined;
    let pages = 0;
    for (;;) {
      const page = await backend.store.list({ after, limit: 2 });
      pages += 1;
      for (const item of page.items) {
        expect(item.storedAt.getTime()).toBeGreaterThan(Date.now() - 10 * 60_000);
        seen.push(item.sha256);
      }
      if (!page.next) break;
      after = page.next;
    }
    // Assert
    expect(seen).toEqual(stored);
    expect(pages).toBeGreaterThanOrEqual(2);
  });

  it('when bytes were stored but their transaction never committed, then the stray sweep removes them once old enough; registered and referenced bytes stay', async () => {
    // Arrange: a stray (put, no registry row, as a process dying before its commit leaves it), an attachment, and an
    // attachment whose registry row is missing (referenced bytes the sweep must not take).
    const stray = pdf();
    await backend.store.put(stray);
    const attached = await upload(pdf());
    const unlisted = await upload(pdf());
    await getSequelize().query('DELETE FROM stored_contents WHERE sha256 = ?', { replacements: [unlisted.body.sha256] });
    // Act: first with the default age (everything here is seconds old), then taking bytes of any age.
    const young = await sweepStrays(backend.store, { pageSize: 2 });
    const strayKeptWhileYoung = await backend.store.has(sha256(stray));
    const old = await sweepStrays(backend.store, { minAgeMs: 0, pageSize: 2 });
    // Assert
    expect([attached.status, unlisted.status]).toEqual([201, 201]);
    expect(young).toEqual({ checked: expect.any(Number), strays: 0, removed: 0, leftovers: 0 });
    expect(young.checked).toBeGreaterThanOrEqual(3);
    expect(strayKeptWhileYoung).toBe(true);
    expect(old.strays).toBeGreaterThanOrEqual(2);
    expect(old.removed).toBeGreaterThanOrEqual(1);
    expect(await backend.store.has(sha256(stray))).toBe(false);
    expect(await registryState(sha256(stray))).toBeNull();
    expect(await registryState(attached.body.sha256)).toBe('live');
    expect((await backend.store.get(attached.body.sha256, { verify: true })).length).toBeGreaterThan(0);
    expect(await backend.store.has(unlisted.body.sha256)).toBe(true);
    expect(await registryState(unlisted.body.sha256)).toBe('live');
  });

  // Only the local folder writes through temporary files: an S3 PUT leaves nothing behind.
  if (name === 'local folder') {
    it('when a write was cut off and left its temporary file, then the sweep removes it once old; a fresh one stays', async () => {
      // Arrange: two temporary files as storeBytes names them, one an hour and a half old.
      const root = (backend.store as LocalContentStore).rootDir;
      const hash = sha256(pdf());
      const folder = path.join(root, hash.slice(0, 2), hash.slice(2, 4));
      fs.mkdirSync(folder, { recursive: true });
      const stale = path.join(folder, `.${hash}.a1b2c3.tmp`);
      const fresh = path.join(folder, `.${hash}.d4e5f6.tmp`);
      fs.writeFileSync(stale, 'partial');
      fs.writeFileSync(fresh, 'partial');
      const past = new Date(Date.now() - 90 * 60_000);
      fs.utimesSync(stale, past, past);
      // Act
      const swept = await sweepStrays(backend.store);
      // Assert
      expect(swept.leftovers).toBe(1);
      expect(fs.existsSync(stale)).toBe(false);
      expect(fs.existsSync(fresh)).toBe(true);
      expect((await backend.store.list({ limit: 1000 })).items.map((i) => i.sha256)).not.toContain(hash);
    });
  }
});
