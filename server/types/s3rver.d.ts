// s3rver 3.7 ships no type declarations; this covers the part server/lib/local-s3.ts uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';
  import type { Server } from 'node:http';

  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
  }

  export default class S3rver {
    constructor(options?: S3rverOptions);
    httpServer?: Server;
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
