import { rm, stat } from 'node:fs/promises';
import { contentPath, readBytes, removeBytes, storeBytes, storedFiles, type StoredContent } from '../uploads';
import type { ContentStore, StoredItem } from './contentStore';

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
    const items: StoredItem[] = [];
    for await (const file of storedFiles(this.rootDir, 'content', options.after)) {
      items.push({ sha256: file.name, storedAt: file.modifiedAt });
      if (items.length >= options.limit) return { items, next: file.name };
    }
    return { items, next: null };
  }

  async removeLeftovers(olderThan: Date): Promise<number> {
    let removed = 0;
    for await (const file of storedFiles(this.rootDir, 'temporary')) {
      if (file.modifiedAt > olderThan) continue;
      await rm(file.path, { force: true });
      removed += 1;
    }
    return removed;
  }
}
