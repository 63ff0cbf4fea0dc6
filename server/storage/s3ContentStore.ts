import type { S3Client, S3ClientConfig } from '@aws-sdk/client-s3';
import { posix } from 'node:path';
import { assertSha256, ContentStoreError, isSha256, sha256Of, type StoredContent } from '../uploads';
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

/** The AWS SDK's S3 module: loaded on first use, so a server on the local store never loads it (4 MB of heap). */
type S3Sdk = typeof import('@aws-sdk/client-s3');
let sdk: Promise<S3Sdk> | undefined;

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
  private connection: Promise<{ s3: S3Sdk; client: S3Client }> | undefined;

  constructor(readonly options: S3StoreOptions) {}

  /** The SDK and this store's client, made on first use. */
  private connect(): Promise<{ s3: S3Sdk; client: S3Client }> {
    this.connection ??= (sdk ??= import('@aws-sdk/client-s3')).then((s3) => {
      const config: S3ClientConfig = {
        region: this.options.region,
        forcePathStyle: this.options.forcePathStyle,
        requestChecksumCalculation: 'WHEN_REQUIRED',
        responseChecksumValidation: 'WHEN_REQUIRED',
        maxAttempts: 3,
      };
      if (this.options.endpoint) config.endpoint = this.options.endpoint;
      if (this.options.credentials) config.credentials = this.options.credentials;
      return { s3, client: new s3.S3Client(config) };
    });
    return this.connection;
  }

  /** The SDK client (for tests that reach the bucket behind the store's back). */
  async client(): Promise<S3Client> {
    return (await this.connect()).client;
  }

  /** The object key of some content (for tests and the scale test's checks). */
  keyOf(sha256: string): string {
    assertSha256(sha256);
    return keyOf(this.options.prefix, sha256);
  }

  async put(bytes: Uint8Array): Promise<StoredContent> {
    const sha256 = sha256Of(bytes);
    const { s3, client } = await this.connect();
    await client.send(
      new s3.PutObjectCommand({
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
    const { s3, client } = await this.connect();
    let bytes: Buffer;
    try {
      const res = await client.send(new s3.GetObjectCommand({ Bucket: this.options.bucket, Key }));
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
    const Key = this.keyOf(sha256);
    const { s3, client } = await this.connect();
    try {
      await client.send(new s3.HeadObjectCommand({ Bucket: this.options.bucket, Key }));
      return true;
    } catch (err) {
      if (isMissing(err)) return false;
      throw err;
    }
  }

  async remove(sha256: string): Promise<boolean> {
    const existed = await this.has(sha256);
    const { s3, client } = await this.connect();
    if (existed) await client.send(new s3.DeleteObjectCommand({ Bucket: this.options.bucket, Key: this.keyOf(sha256) }));
    return existed;
  }

  async list(options: { after?: string; limit: number }): Promise<{ items: StoredItem[]; next: string | null }> {
    // Keys are <prefix>/ab/cd/<sha256>, so key order is hash order; the page goes on after the last key listed.
    // The first version of the listing call, with a marker: every S3-compatible service has it, while the second
    // version's continuation tokens are missing from some (the fake S3 of the tests cannot make them).
    const folder = posix.join(this.options.prefix, 'x').slice(0, -1);
    const { s3, client } = await this.connect();
    const res = await client.send(
      new s3.ListObjectsCommand({
        Bucket: this.options.bucket,
        Prefix: folder || undefined,
        Marker: options.after,
        MaxKeys: options.limit,
      }),
    );
    const items: StoredItem[] = [];
    let lastKey: string | null = null;
    for (const object of res.Contents ?? []) {
      lastKey = object.Key ?? lastKey;
      const name = posix.basename(object.Key ?? '');
      // Only objects at a content address are content (anything else someone put in the folder is left alone).
      if (!isSha256(name) || object.Key !== this.keyOf(name)) continue;
      items.push({ sha256: name, storedAt: object.LastModified ?? new Date(0) });
    }
    return { items, next: res.IsTruncated ? lastKey : null };
  }
}
