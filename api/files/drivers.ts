import { randomBytes } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { DeleteObjectsCommand, GetObjectCommand, ListObjectsV2Command, NoSuchKey, S3Client } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { FilesConfig } from '../config.ts';

/**
 * Where the bytes of stored files live. Keys are relative paths Plinth made itself
 * (`<purpose>/<uuid>.<ext>`), never anything from a request; the bytes are exactly what was
 * written (sealed files stay sealed). Only api/files/ and the maintenance scripts use a store.
 */
export interface FileStore {
  readonly driver: 'local' | 's3';
  /** Writes an object whole (a reader sees the old bytes or the new, never half); an existing key is replaced (the key rotation's re-seal). */
  put(key: string, body: Buffer | Readable, contentType: string): Promise<void>;
  /** The stored bytes, or null when there is no such object. */
  get(key: string): Promise<Buffer | null>;
  /** Removes objects; a key that is already gone is no error. */
  remove(keys: readonly string[]): Promise<void>;
  /** Every key under a folder (or all), in no particular order. */
  list(folder?: string): AsyncIterable<string>;
  close(): void;
}

const KEY = /^[a-z_]+\/[A-Za-z0-9_.-]+$/;

function checkKey(key: string): string {
  if (!KEY.test(key) || key.includes('..')) throw new Error(`bad storage key ${JSON.stringify(key)}`);
  return key;
}

/** Files on this machine's disk, under one folder; written to a temporary name and renamed. */
export function localFileStore(dir: string): FileStore {
  const root = path.resolve(dir);
  const abs = (key: string) => path.join(root, ...checkKey(key).split('/'));
  async function write(key: string, body: Buffer | Readable): Promise<void> {
    const target = abs(key);
    await fs.mkdir(path.dirname(target), { recursive: true });
    const tmp = `${target}.${randomBytes(4).toString('hex')}.part`;
    await fs.writeFile(tmp, body, { flag: 'wx' });
    await fs.rename(tmp, target);
  }
  return {
    driver: 'local',
    put: (key, body) => write(key, body),
    async get(key) {
      try {
        return await fs.readFile(abs(key));
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },
    async remove(keys) {
      await Promise.all(keys.map((k) => fs.rm(abs(k), { force: true })));
    },
    async *list(folder) {
      const folders = folder ? [folder] : (await fs.readdir(root, { withFileTypes: true }).catch(() => [])).filter((e) => e.isDirectory()).map((e) => e.name);
      for (const f of folders) {
        for (const name of await fs.readdir(path.join(root, f)).catch(() => [] as string[])) {
          if (!name.endsWith('.part') && KEY.test(`${f}/${name}`)) yield `${f}/${name}`;
        }
      }
    },
    close() {},
  };
}

/**
 * Files in an S3-compatible bucket. Uploads go through lib-storage (multipart once a body passes
 * 5 MiB, so a stream is never held whole); reads come back through Plinth's own authorised
 * routes, so the bucket stays private and no object URL is ever handed out.
 */
export function s3FileStore(cfg: Extract<FilesConfig, { driver: 's3' }>): FileStore {
  const client = new S3Client({
    region: cfg.region,
    ...(cfg.endpoint ? { endpoint: cfg.endpoint } : {}),
    ...(cfg.credentials ? { credentials: cfg.credentials } : {}),
    forcePathStyle: cfg.forcePathStyle,
    // Checksums only where S3 demands them: most S3-compatible services accept nothing newer.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const Bucket = cfg.bucket;
  const objectKey = (key: string) => `${cfg.prefix}${checkKey(key)}`;
  return {
    driver: 's3',
    async put(key, body, contentType) {
      await new Upload({ client, params: { Bucket, Key: objectKey(key), Body: body, ContentType: contentType }, queueSize: 2 }).done();
    },
    async get(key) {
      try {
        const res = await client.send(new GetObjectCommand({ Bucket, Key: objectKey(key) }));
        return res.Body ? Buffer.from(await res.Body.transformToByteArray()) : Buffer.alloc(0);
      } catch (err) {
        if (err instanceof NoSuchKey || (err as { name?: string }).name === 'NoSuchKey') return null;
        throw err;
      }
    },
    async remove(keys) {
      for (let i = 0; i < keys.length; i += 1000) {
        const Objects = keys.slice(i, i + 1000).map((k) => ({ Key: objectKey(k) }));
        const res = await client.send(new DeleteObjectsCommand({ Bucket, Delete: { Objects, Quiet: true } }));
        const failed = (res.Errors ?? []).filter((e) => e.Code !== 'NoSuchKey');
        if (failed.length) throw new Error(`could not remove ${failed.length} stored file(s): ${failed[0]?.Code ?? ''} ${failed[0]?.Message ?? ''}`);
      }
    },
    async *list(folder) {
      let ContinuationToken: string | undefined;
      do {
        const res = await client.send(new ListObjectsV2Command({ Bucket, Prefix: `${cfg.prefix}${folder ? `${folder}/` : ''}`, ContinuationToken }));
        for (const o of res.Contents ?? []) if (o.Key) yield o.Key.slice(cfg.prefix.length);
        ContinuationToken = res.IsTruncated ? res.NextContinuationToken : undefined;
      } while (ContinuationToken);
    },
    close() {
      client.destroy();
    },
  };
}

export function createFileStore(cfg: FilesConfig): FileStore {
  return cfg.driver === 's3' ? s3FileStore(cfg) : localFileStore(cfg.dir);
}
