// The parts of s3rver 3.7 (no types of its own on npm) that the tests use; from its README.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    configureBuckets?: { name: string; configs: (string | Buffer)[] }[];
  }

  export default class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
