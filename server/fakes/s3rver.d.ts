// Minimal typings for s3rver 3.7 (it ships none): only what server/fakes/s3.ts calls.
declare module 's3rver' {
  import type { Server } from 'node:http';
  import type { AddressInfo } from 'node:net';

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

  class S3rver {
    constructor(options?: S3rverOptions);
    httpServer?: Server;
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
  export default S3rver;
}
