import { createHash, randomBytes } from 'node:crypto';
import { mkdir, readdir, readFile, rename, rm, stat, unlink, writeFile } from 'node:fs/promises';
import { isAbsolute, join, posix, resolve } from 'node:path';

/** Where stored bytes live, relative to the store's root. */
export interface StoredContent {
  /** Lower-case hex SHA-256 of the content: its name and its only address. */
  sha256: string;
  /** `ab/cd/<sha256>` with forward slashes, relative to the store's root. */
  relPath: string;
  /** Size [bytes]. */
  size: number;
}

/** Why the content store refused a request. */
export type ContentStoreErrorCode = 'invalid_hash' | 'not_found' | 'corrupt';

/** A request the content store cannot serve (a bad address, missing or damaged content). */
export class ContentStoreError extends Error {
  readonly code: ContentStoreErrorCode;
  /** HTTP status a route should answer with (400 bad address, 404 missing, 500 damaged). */
  readonly httpStatus: number;

  constructor(code: ContentStoreErrorCode, message: string) {
    super(message);
    this.name = 'ContentStoreError';
    this.code = code;
    this.httpStatus = code === 'invalid_hash' ? 400 : code === 'not_found' ? 404 : 500;
  }
}

const SHA256_HEX = /^[0-9a-f]{64}$/;

/** Whether a name is a content address: exactly 64 lower-case hex digits. */
export function isSha256(name: unknown): name is string {
  return typeof name === 'string' && SHA256_HEX.test(name);
}

/**
 * Throws unless `sha256` is exactly 64 lower-case hex digits, so a stored name can never be a path
 * (`../x`, `/etc/passwd`, `a/b`) however it reaches the store.
 * @param sha256 - the address to check
 * @throws ContentStoreError 'invalid_hash'
 */
export function assertSha256(sha256: unknown): asserts sha256 is string {
  if (!isSha256(sha256)) {
    throw new ContentStoreError('invalid_hash', '[contentStore] a content address must be 64 lower-case hex digits');
  }
}

function rootOf(rootDir: string): string {
  if (typeof rootDir !== 'string' || rootDir === '') throw new TypeError('[contentStore] rootDir is required');
  return isAbsolute(rootDir) ? rootDir : resolve(rootDir);
}

/** `ab/cd/<sha256>`: two levels of fan-out keep directories small. */
function relPathOf(sha256: string): string {
  return posix.join(sha256.slice(0, 2), sha256.slice(2, 4), sha256);
}

/**
 * Absolute path of stored content, for streaming it (e.g. `res.sendFile`). The address is validated first.
 * @param rootDir - the store's root folder (absolute, or resolved against the working directory)
 * @param sha256 - 64 lower-case hex digits
 * @returns the file's absolute path (which may not exist)
 * @throws ContentStoreError 'invalid_hash'
 */
export function contentPath(rootDir: string, sha256: string): string {
  assertSha256(sha256);
  return join(rootOf(rootDir), ...relPathOf(sha256).split('/'));
}

/**
 * Hex SHA-256 of some bytes.
 * @param bytes - the content
 * @returns 64 lower-case hex digits
 */
export function sha256Of(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** A write in progress: `.<sha256>.<random>.tmp` in the folder where the content goes (see storeBytes). */
const TEMPORARY = /^\.[0-9a-f]{64}\.[0-9a-f]+\.tmp$/;
const HEX2 = /^[0-9a-f]{2}$/;

/** Entries of a folder that match `pattern`, sorted; none when the folder does not exist. */
async function namesIn(dir: string, pattern: RegExp): Promise<string[]> {
  const names = await readdir(dir).catch((err: NodeJS.ErrnoException) => {
    if (err.code === 'ENOENT') return [] as string[];
    throw err;
  });
  return names.filter((n) => pattern.test(n)).sort();
}

/**
 * The files of a store's folder, in name order: its contents (`root/ab/cd/<sha256>`) or the temporary files of
 * writes that never finished. For contents, `after` skips every name up to and including it, and the folders that
 * sort before it are not read.
 * @param rootDir - the store's root folder
 * @param kind - 'content' or 'temporary'
 * @param after - (contents) the last name already seen
 */
export async function* storedFiles(
  rootDir: string,
  kind: 'content' | 'temporary',
  after = '',
): AsyncGenerator<{ name: string; path: string; modifiedAt: Date }> {
  const root = rootOf(rootDir);
  for (const ab of await namesIn(root, HEX2)) {
    if (ab < after.slice(0, 2)) continue;
    for (const cd of await namesIn(join(root, ab), HEX2)) {
      if (ab + cd < after.slice(0, 4)) continue;
      for (const name of await namesIn(join(root, ab, cd), kind === 'content' ? SHA256_HEX : TEMPORARY)) {
        if (kind === 'content' && (name <= after || !name.startsWith(ab + cd))) continue;
        const path = join(root, ab, cd, name);
        const found = await stat(path).catch(() => undefined);
        if (found?.isFile()) yield { name, path, modifiedAt: found.mtime };
      }
    }
  }
}

/**
 * Stores bytes under their SHA-256 at `root/ab/cd/<sha256>`. Atomic: written to a temporary file in the same
 * folder, flushed, then renamed into place, so a reader never sees a partial file. Idempotent: content already
 * stored is left as it is.
 * @param rootDir - the store's root folder (created when missing)
 * @param bytes - the content
 * @returns its address, path relative to the root, and size
 */
export async function storeBytes(rootDir: string, bytes: Uint8Array): Promise<StoredContent> {
  const sha256 = sha256Of(bytes);
  const relPath = relPathOf(sha256);
  const target = contentPath(rootDir, sha256);
  const existing = await stat(target).catch(() => undefined);
  if (existing?.isFile() && existing.size === bytes.length) return { sha256, relPath, size: bytes.length };

  const folder = join(rootOf(rootDir), sha256.slice(0, 2), sha256.slice(2, 4));
  await mkdir(folder, { recursive: true });
  const temp = join(folder, `.${sha256}.${randomBytes(6).toString('hex')}.tmp`);
  try {
    await writeFile(temp, bytes, { flag: 'wx', flush: true });
    // rename() replaces atomically; a concurrent writer of the same content renames identical bytes.
    await rename(temp, target);
  } catch (err) {
    await rm(temp, { force: true });
    throw err;
  }
  return { sha256, relPath, size: bytes.length };
}

/**
 * Reads stored content back.
 * @param rootDir - the store's root folder
 * @param sha256 - 64 lower-case hex digits (never a user-supplied path)
 * @param opts - `verify: true` re-hashes the bytes and refuses content that no longer matches its name
 * @returns the content
 * @throws ContentStoreError 'invalid_hash' | 'not_found' | 'corrupt'
 */
export async function readBytes(rootDir: string, sha256: string, opts: { verify?: boolean } = {}): Promise<Buffer> {
  const path = contentPath(rootDir, sha256);
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') {
      throw new ContentStoreError('not_found', `[contentStore] no content ${sha256}`);
    }
    throw err;
  }
  if (opts.verify && sha256Of(bytes) !== sha256) {
    throw new ContentStoreError('corrupt', `[contentStore] content ${sha256} no longer matches its hash`);
  }
  return bytes;
}

/**
 * Removes stored content. The caller decides whether nothing else refers to it (content is shared by hash).
 * @param rootDir - the store's root folder
 * @param sha256 - 64 lower-case hex digits
 * @returns true when a file was removed, false when there was none
 * @throws ContentStoreError 'invalid_hash'
 */
export async function removeBytes(rootDir: string, sha256: string): Promise<boolean> {
  const path = contentPath(rootDir, sha256);
  try {
    await unlink(path);
    return true;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return false;
    throw err;
  }
}
