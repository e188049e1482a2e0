// s3rver ships no types; only what scripts/s3-fake.ts uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';
  export default class S3rver {
    constructor(options: { port?: number; address?: string; silent?: boolean; directory: string; configureBuckets?: { name: string; configs?: string[] }[] });
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
