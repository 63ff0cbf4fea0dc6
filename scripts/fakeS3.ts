/**
 * A local fake S3 service (the `s3rver` package) for development and tests of `STORAGE=s3`: objects live in a folder,
 * the bucket is created on start, and it answers the calls the app's S3 client makes (put, get, head, delete).
 * Credentials: access key `S3RVER`, secret `S3RVER`; path-style addresses.
 *
 *   tsx scripts/fakeS3.ts [--port 4605] [--dir .data-scale/s3] [--bucket gantrywright]   run until Ctrl-C
 */
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import S3rver from 's3rver';

/** The fixed credentials the fake service accepts. */
export const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

/** A running fake S3 service. */
export type FakeS3 = { endpoint: string; port: number; bucket: string; close: () => Promise<void> };

/**
 * Starts the fake S3 service on 127.0.0.1:`port` (0 picks a free one) with its objects under `dir`, and creates
 * `bucket` (at least three characters) when missing.
 */
export async function startFakeS3(options: { port: number; dir: string; bucket: string }): Promise<FakeS3> {
  fs.mkdirSync(options.dir, { recursive: true });
  const server = new S3rver({
    port: options.port,
    address: '127.0.0.1',
    silent: true,
    directory: options.dir,
    configureBuckets: [{ name: options.bucket, configs: [] }],
    vhostBuckets: false,
  });
  const address = (await server.run()) as AddressInfo;
  const endpoint = `http://127.0.0.1:${address.port}`;
  return { endpoint, port: address.port, bucket: options.bucket, close: () => server.close() };
}

function option(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const { resolveFromRoot } = await import('../server/paths');
  const fake = await startFakeS3({
    port: Number(option(args, '--port') ?? 4605),
    dir: resolveFromRoot(option(args, '--dir') ?? path.join('.data-scale', 's3')),
    bucket: option(args, '--bucket') ?? 'gantrywright',
  });
  process.stdout.write(`Fake S3 on ${fake.endpoint}, bucket ${fake.bucket} (credentials S3RVER / S3RVER). Ctrl-C stops it.\n`);
  const stop = () => void fake.close().then(() => process.exit(0));
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  void main();
}
