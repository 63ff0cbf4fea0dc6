import { readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { contentPath, readBytes, removeBytes, storeBytes, type StoredContent } from '../uploads';
import type { ContentStore, StoredItem } from './contentStore';

const HEX2 = /^[0-9a-f]{2}$/;
const SHA256_HEX = /^[0-9a-f]{64}$/;
/** A write in progress: `.<sha256>.<random>.tmp` next to where the content goes (see storeBytes). */
const TEMPORARY = /^\.[0-9a-f]{64}\.[0-9a-f]+\.tmp$/;

/** Entries of a folder that match `pattern`, sorted; none when the folder does not exist. */
async function namesIn(dir: string, pattern: RegExp): Promise<string[]> {
  const names = await readdir(dir).catch((err: NodeJS.ErrnoException) => {
    if (err.code === 'ENOENT') return [] as string[];
    throw err;
  });
  return names.filter((n) => pattern.test(n)).sort();
}

/**
 * The content store in a local folder (`UPLOAD_DIR`, default `.data/uploads`): `root/ab/cd/<sha256>`, written to a
 * temporary file and renamed into place. With several app processes the folder must be shared storage that every
 * process mounts; the S3 back end needs no shared folder.
 */
export class LocalContentStore implements ContentStore {
  readonly kind = 'local' as const;

  constructor(readonly rootDir: string) {}

  put(bytes: Uint8Array): Promise<StoredContent> {
    return storeBytes(this.rootDir, bytes);
  }

  get(sha256: string, options: { verify?: boolean } = {}): Promise<Buffer> {
    return readBytes(this.rootDir, sha256, options);
  }

  async has(sha256: string): Promise<boolean> {
    const found = await stat(contentPath(this.rootDir, sha256)).catch(() => undefined);
    return !!found?.isFile();
  }

  remove(sha256: string): Promise<boolean> {
    return removeBytes(this.rootDir, sha256);
  }

  async list(options: { after?: string; limit: number }): Promise<{ items: StoredItem[]; next: string | null }> {
    // Walks ab/cd/<sha256> in name order, skipping the folders that sort before `after` (temporary files of a write
    // in progress and anything else not named by a hash are not content).
    const after = options.after ?? '';
    const items: StoredItem[] = [];
    for (const ab of await namesIn(this.rootDir, HEX2)) {
      if (ab < after.slice(0, 2)) continue;
      for (const cd of await namesIn(join(this.rootDir, ab), HEX2)) {
        if (ab + cd < after.slice(0, 4)) continue;
        for (const name of await namesIn(join(this.rootDir, ab, cd), SHA256_HEX)) {
          if (name <= after || !name.startsWith(ab + cd)) continue;
          const found = await stat(join(this.rootDir, ab, cd, name)).catch(() => undefined);
          if (!found?.isFile()) continue;
          items.push({ sha256: name, storedAt: found.mtime });
          if (items.length >= options.limit) return { items, next: name };
        }
      }
    }
    return { items, next: null };
  }

  async removeLeftovers(olderThan: Date): Promise<number> {
    let removed = 0;
    for (const ab of await namesIn(this.rootDir, HEX2)) {
      for (const cd of await namesIn(join(this.rootDir, ab), HEX2)) {
        for (const name of await namesIn(join(this.rootDir, ab, cd), TEMPORARY)) {
          const file = join(this.rootDir, ab, cd, name);
          const found = await stat(file).catch(() => undefined);
          if (!found?.isFile() || found.mtime > olderThan) continue;
          await rm(file, { force: true });
          removed += 1;
        }
      }
    }
    return removed;
  }
}
