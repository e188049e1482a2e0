// A local S3-compatible service (s3rver, a development dependency) for the test runner: objects
// live in a temporary folder that disappears with it.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';

export interface S3Fake {
  endpoint: string;
  close(): Promise<void>;
}

export async function startS3Fake(): Promise<S3Fake> {
  const { default: S3rver } = await import('s3rver');
  const directory = await mkdtemp(path.join(tmpdir(), 'plinth-s3-'));
  const server = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory });
  const address = await server.run();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    async close() {
      await server.close();
      await rm(directory, { recursive: true, force: true });
    },
  };
}
