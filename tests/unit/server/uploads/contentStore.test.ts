import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { assertSha256, ContentStoreError, contentPath, readBytes, removeBytes, sha256Of, storeBytes } from '../../../../server/uploads';

let root: string;

beforeEach(async () => {
  root = await mkdtemp(join(tmpdir(), 'gw-content-'));
});

afterEach(async () => {
  await rm(root, { recursive: true, force: true });
});

async function storeErrorOf(run: () => Promise<unknown>): Promise<ContentStoreError> {
  try {
    await run();
  } catch (err) {
    if (err instanceof ContentStoreError) return err;
    throw err;
  }
  throw new Error('expected a ContentStoreError');
}

/** Every file under a folder, relative, with forward slashes. */
async function listFiles(dir: string, prefix = ''): Promise<string[]> {
  const entries = await readdir(dir, { withFileTypes: true });
  const nested = await Promise.all(
    entries.map((e) => (e.isDirectory() ? listFiles(join(dir, e.name), `${prefix}${e.name}/`) : Promise.resolve([`${prefix}${e.name}`]))),
  );
  return nested.flat().sort();
}

// Writes are flushed to disk (fsync), which a busy machine can make slow: the timeout is a safety net only.
describe('storeBytes', { timeout: 30_000 }, () => {
  it('when bytes are stored, then they land at ab/cd/<sha256> under the root with their SHA-256 and size', async () => {
    // Arrange
    const bytes = Buffer.from('speed_rpm,torque_Ncm\n0,40\n60,38\n120,30\n');
    const expectedSha = createHash('sha256').update(bytes).digest('hex');
    // Act
    const stored = await storeBytes(root, bytes);
    // Assert
    expect(stored).toEqual({
      sha256: expectedSha,
      relPath: `${expectedSha.slice(0, 2)}/${expectedSha.slice(2, 4)}/${expectedSha}`,
      size: bytes.length,
    });
    expect(await readFile(join(root, stored.relPath))).toEqual(bytes);
    expect(await listFiles(root)).toEqual([stored.relPath]);
  });

  it('when the SHA-256 of "abc" is taken, then it is the FIPS 180-2 example digest', () => {
    // Arrange / Act / Assert — FIPS 180-2, Appendix B.1 (one-block message "abc").
    expect(sha256Of(Buffer.from('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('when the same bytes are stored twice, then the second call returns the same address and leaves one file', async () => {
    // Arrange
    const bytes = Buffer.from([1, 2, 3, 4, 5]);
    const first = await storeBytes(root, bytes);
    const before = await stat(join(root, first.relPath));
    // Act
    const second = await storeBytes(root, bytes);
    // Assert
    expect(second).toEqual(first);
    expect((await stat(join(root, first.relPath))).mtimeMs).toBe(before.mtimeMs);
    expect(await listFiles(root)).toEqual([first.relPath]);
  });

  it('when the same bytes are stored concurrently, then one complete file and no temporary files remain', async () => {
    // Arrange
    const bytes = Buffer.alloc(64 * 1024, 7);
    // Act
    const results = await Promise.all(Array.from({ length: 5 }, () => storeBytes(root, bytes)));
    // Assert
    expect(new Set(results.map((r) => r.sha256)).size).toBe(1);
    expect(await listFiles(root)).toEqual([results[0].relPath]);
    expect(await readFile(join(root, results[0].relPath))).toEqual(bytes);
  });

  it('when a stored file was cut short on disk, then storing the content again repairs it', async () => {
    // Arrange
    const bytes = Buffer.from('0123456789');
    const stored = await storeBytes(root, bytes);
    await writeFile(join(root, stored.relPath), bytes.subarray(0, 3));
    // Act
    await storeBytes(root, bytes);
    // Assert
    expect(await readFile(join(root, stored.relPath))).toEqual(bytes);
  });

  it('when empty content is stored, then it is stored under the SHA-256 of nothing', async () => {
    // Arrange / Act
    const stored = await storeBytes(root, new Uint8Array(0));
    // Assert
    expect(stored.sha256).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
    expect(stored.size).toBe(0);
  });
});

describe('readBytes', () => {
  it('when stored content is read by its address, then the same bytes come back', async () => {
    // Arrange
    const bytes = Buffer.from('%PDF-1.7 datasheet');
    const { sha256 } = await storeBytes(root, bytes);
    // Act
    const read = await readBytes(root, sha256, { verify: true });
    // Assert
    expect(read).toEqual(bytes);
  });

  it.each([
    ['a parent-folder path', '../x'],
    ['an absolute path', '/etc/passwd'],
    ['a nested path', 'ab/cd/ef'],
    ['63 hex digits', 'a'.repeat(63)],
    ['65 hex digits', 'a'.repeat(65)],
    ['upper-case hex', 'A'.repeat(64)],
    ['a traversal padded to 64 characters', `../../${'a'.repeat(58)}`],
    ['an empty string', ''],
  ])('when the address is %s, then it throws invalid_hash before touching the disk', async (_name, address) => {
    // Arrange / Act
    const error = await storeErrorOf(() => readBytes(root, address));
    // Assert
    expect(error.code).toBe('invalid_hash');
    expect(error.httpStatus).toBe(400);
  });

  it('when nothing is stored at a valid address, then it throws not_found', async () => {
    // Arrange / Act
    const error = await storeErrorOf(() => readBytes(root, 'f'.repeat(64)));
    // Assert
    expect(error.code).toBe('not_found');
    expect(error.httpStatus).toBe(404);
  });

  it('when stored bytes were altered on disk and verify is asked, then it throws corrupt', async () => {
    // Arrange
    const { sha256, relPath } = await storeBytes(root, Buffer.from('original'));
    await writeFile(join(root, relPath), 'tampered');
    // Act
    const error = await storeErrorOf(() => readBytes(root, sha256, { verify: true }));
    // Assert
    expect(error.code).toBe('corrupt');
  });
});

describe('removeBytes', () => {
  it('when stored content is removed, then it is gone and a second removal reports false', async () => {
    // Arrange
    const { sha256 } = await storeBytes(root, Buffer.from('photo'));
    // Act
    const first = await removeBytes(root, sha256);
    const second = await removeBytes(root, sha256);
    // Assert
    expect(first).toBe(true);
    expect(second).toBe(false);
    expect((await storeErrorOf(() => readBytes(root, sha256))).code).toBe('not_found');
  });

  it('when the address is a path, then it throws invalid_hash and removes nothing', async () => {
    // Arrange
    const { relPath } = await storeBytes(root, Buffer.from('keep me'));
    // Act
    const error = await storeErrorOf(() => removeBytes(root, '../x'));
    // Assert
    expect(error.code).toBe('invalid_hash');
    expect(await listFiles(root)).toEqual([relPath]);
  });
});

describe('contentPath and assertSha256', () => {
  it('when a valid address is given, then the path lies inside the root', () => {
    // Arrange
    const sha = sha256Of(Buffer.from('x'));
    // Act
    const path = contentPath(root, sha);
    // Assert
    expect(path).toBe(join(root, sha.slice(0, 2), sha.slice(2, 4), sha));
  });

  it.each([[42], [null], [undefined], ['g'.repeat(64)]])('when the address is %s, then assertSha256 throws', (value) => {
    // Arrange / Act / Assert
    expect(() => assertSha256(value)).toThrow(ContentStoreError);
  });
});
