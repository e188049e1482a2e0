import { randomBytes } from 'node:crypto';
import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3';

/** The local S3 fake the test runner started (scripts/test.ts), or null when tests run without it. */
export function testS3Endpoint(): string | null {
  return process.env.TEST_S3_ENDPOINT ?? null;
}

export const TEST_S3_KEYS = { S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER' } as const;

/** A new empty bucket on the fake, so every test app has stored files of its own; returns the settings that select it. */
export async function createTestBucket(endpoint: string): Promise<Record<string, string>> {
  const bucket = `plinth-test-${randomBytes(6).toString('hex')}`;
  const client = new S3Client({
    endpoint,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: { accessKeyId: TEST_S3_KEYS.S3_ACCESS_KEY_ID, secretAccessKey: TEST_S3_KEYS.S3_SECRET_ACCESS_KEY },
  });
  try {
    await client.send(new CreateBucketCommand({ Bucket: bucket }));
  } finally {
    client.destroy();
  }
  return { FILE_STORE: 's3', S3_ENDPOINT: endpoint, S3_BUCKET: bucket, ...TEST_S3_KEYS };
}
