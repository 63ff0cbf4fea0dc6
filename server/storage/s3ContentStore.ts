import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsCommand,
  PutObjectCommand,
  S3Client,
  type S3ClientConfig,
} from '@aws-sdk/client-s3';
import { posix } from 'node:path';
import { assertSha256, ContentStoreError, sha256Of, type StoredContent } from '../uploads';
import type { ContentStore, StoredItem } from './contentStore';

/** How to reach the bucket (see `STORAGE=s3` in .env.example). */
export type S3StoreOptions = {
  bucket: string;
  /** Folder inside the bucket ('' for none). */
  prefix: string;
  region: string;
  /** An S3-compatible service's address; unset means AWS itself. */
  endpoint?: string;
  forcePathStyle: boolean;
  /** Unset: the SDK's default chain (environment, profile, instance role). */
  credentials?: { accessKeyId: string; secretAccessKey: string };
};

/** `ab/cd/<sha256>` as in the local folder, under the configured prefix. */
function keyOf(prefix: string, sha256: string): string {
  return posix.join(prefix, sha256.slice(0, 2), sha256.slice(2, 4), sha256);
}

function isMissing(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404;
}

/**
 * The content store in an S3-compatible bucket through the AWS SDK v3 client. An S3 PUT is atomic (an object is
 * visible whole or not at all) and putting the same bytes again replaces them with identical bytes, so the store
 * is atomic and idempotent like the local folder. Reads re-hash the bytes: what the store returns is checked, not
 * trusted. Checksums of the transport are left to the SDK only where the service requires them, which keeps the
 * client working with stores that do not know the newer checksum headers.
 */
export class S3ContentStore implements ContentStore {
  readonly kind = 's3' as const;
  readonly client: S3Client;

  constructor(readonly options: S3StoreOptions) {
    const config: S3ClientConfig = {
      region: options.region,
      forcePathStyle: options.forcePathStyle,
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
      maxAttempts: 3,
    };
    if (options.endpoint) config.endpoint = options.endpoint;
    if (options.credentials) config.credentials = options.credentials;
    this.client = new S3Client(config);
  }

  /** The object key of some content (for tests and the scale test's checks). */
  keyOf(sha256: string): string {
    assertSha256(sha256);
    return keyOf(this.options.prefix, sha256);
  }

  async put(bytes: Uint8Array): Promise<StoredContent> {
    const sha256 = sha256Of(bytes);
    await this.client.send(
      new PutObjectCommand({
        Bucket: this.options.bucket,
        Key: this.keyOf(sha256),
        Body: bytes,
        ContentLength: bytes.length,
        ContentType: 'application/octet-stream',
        Metadata: { sha256 },
      }),
    );
    return { sha256, relPath: keyOf('', sha256), size: bytes.length };
  }

  async get(sha256: string, options: { verify?: boolean } = {}): Promise<Buffer> {
    const Key = this.keyOf(sha256);
    let bytes: Buffer;
    try {
      const res = await this.client.send(new GetObjectCommand({ Bucket: this.options.bucket, Key }));
      if (!res.Body) throw new ContentStoreError('not_found', `[contentStore] no content ${sha256}`);
      bytes = Buffer.from(await res.Body.transformToByteArray());
    } catch (err) {
      if (isMissing(err)) throw new ContentStoreError('not_found', `[contentStore] no content ${sha256}`);
      throw err;
    }
    if (options.verify && sha256Of(bytes) !== sha256) {
      throw new ContentStoreError('corrupt', `[contentStore] content ${sha256} no longer matches its hash`);
    }
    return bytes;
  }

  async has(sha256: string): Promise<boolean> {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.options.bucket, Key: this.keyOf(sha256) }));
      return true;
    } catch (err) {
      if (isMissing(err)) return false;
      throw err;
    }
  }

  async remove(sha256: string): Promise<boolean> {
    const existed = await this.has(sha256);
    if (existed) await this.client.send(new DeleteObjectCommand({ Bucket: this.options.bucket, Key: this.keyOf(sha256) }));
    return existed;
  }

  async list(options: { after?: string; limit: number }): Promise<{ items: StoredItem[]; next: string | null }> {
    // Keys are <prefix>/ab/cd/<sha256>, so key order is hash order; the page goes on after the last key listed.
    // The first version of the listing call, with a marker: every S3-compatible service has it, while the second
    // version's continuation tokens are missing from some (the fake S3 of the tests cannot make them).
    const folder = posix.join(this.options.prefix, 'x').slice(0, -1);
    const res = await this.client.send(
      new ListObjectsCommand({ Bucket: this.options.bucket, Prefix: folder || undefined, Marker: options.after, MaxKeys: options.limit }),
    );
    const items: StoredItem[] = [];
    let lastKey: string | null = null;
    for (const object of res.Contents ?? []) {
      lastKey = object.Key ?? lastKey;
      const name = posix.basename(object.Key ?? '');
      // Only objects at a content address are content (anything else someone put in the folder is left alone).
      if (!/^[0-9a-f]{64}$/.test(name) || object.Key !== this.keyOf(name)) continue;
      items.push({ sha256: name, storedAt: object.LastModified ?? new Date(0) });
    }
    return { items, next: res.IsTruncated ? lastKey : null };
  }
}
