// Types for the parts of the `s3rver` package (a fake S3 service for development and tests) that scripts/fakeS3.ts uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  type S3rverOptions = {
    port?: number;
    address?: string;
    silent?: boolean;
    directory: string;
    configureBuckets?: Array<{ name: string; configs: Array<string | Buffer> }>;
    vhostBuckets?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
  };

  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
