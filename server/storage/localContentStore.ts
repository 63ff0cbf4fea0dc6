import { stat } from 'node:fs/promises';
import { contentPath, readBytes, removeBytes, storeBytes, type StoredContent } from '../uploads';
import type { ContentStore } from './contentStore';

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
}
