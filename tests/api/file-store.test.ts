// Both file drivers keep the same promises: bytes back exactly as written, sealed files sealed in
// the store, keys only of Plinth's own making, and downloads only through the authorised routes.
import { createHash, randomBytes } from 'node:crypto';
import { mkdtemp, readdir, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseConfig } from '../../api/config.ts';
import { createFileStore, type FileStore, readStoredFile, storeFile } from '../../api/files/store.ts';
import { cameraJpeg } from '../fixtures/images.ts';
import { createTestApp, TEST_MEDICAL_KEY, type TestApp } from '../support/app.ts';
import { createTestBucket, testS3Endpoint } from '../support/s3.ts';

function s3Endpoint(): string {
  const endpoint = testS3Endpoint();
  if (!endpoint) throw new Error('TEST_S3_ENDPOINT is not set: run the tests with `npm test`, which starts the S3 fake.');
  return endpoint;
}

let dir: string;
const stores: Record<'local' | 's3', FileStore> = {} as never;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'plinth-store-'));
  stores.local = createFileStore(parseConfig({ NODE_ENV: 'test', STORAGE_DIR: dir, MEDICAL_DATA_KEY: TEST_MEDICAL_KEY }).files);
  // A key prefix, as a bucket shared with other things would have.
  stores.s3 = createFileStore(parseConfig({ NODE_ENV: 'test', ...(await createTestBucket(s3Endpoint())), S3_PREFIX: 'studio-a/' }).files);
});
afterAll(async () => {
  stores.local?.close();
  stores.s3?.close();
  await rm(dir, { recursive: true, force: true });
});

const all = async (it: AsyncIterable<string>) => {
  const out: string[] = [];
  for await (const k of it) out.push(k);
  return out.sort();
};

describe.each(['local', 's3'] as const)('the %s driver', (driver) => {
  it('gives back exactly the bytes written, replaces on a second write, and lists and removes by folder', async () => {
    const store = stores[driver];
    expect(store.driver).toBe(driver);
    const a = randomBytes(3000);
    await store.put('trial/a.bin', a, 'application/octet-stream');
    await store.put('trial/b.bin', Buffer.from('second'), 'text/plain');
    expect((await store.get('trial/a.bin'))!.equals(a)).toBe(true);
    await store.put('trial/b.bin', Buffer.from('replaced'), 'text/plain');
    expect((await store.get('trial/b.bin'))!.toString()).toBe('replaced');
    expect(await all(store.list('trial'))).toEqual(['trial/a.bin', 'trial/b.bin']);
    await store.remove(['trial/a.bin', 'trial/never-was.bin']);
    expect(await store.get('trial/a.bin')).toBeNull();
    expect(await all(store.list('trial'))).toEqual(['trial/b.bin']);
  });

  it('streams a body larger than one upload part without holding it whole', async () => {
    const store = stores[driver];
    // 12 MiB: more than two of lib-storage's 5 MiB parts, so the bucket gets a multipart upload.
    const chunk = randomBytes(1024 * 1024);
    const expected = createHash('sha256');
    for (let i = 0; i < 12; i++) expected.update(chunk);
    await store.put('trial/big.bin', Readable.from((function* () { for (let i = 0; i < 12; i++) yield chunk; })()), 'application/octet-stream');
    const back = await store.get('trial/big.bin');
    expect(back!.length).toBe(12 * 1024 * 1024);
    expect(createHash('sha256').update(back!).digest('hex')).toBe(expected.digest('hex'));
  });

  it('refuses a key that is not of its own making', async () => {
    const store = stores[driver];
    for (const key of ['../escape.bin', 'trial/../../x.bin', '/abs.bin', 'Trial/a.bin', 'trial/a b.bin', 'noslash']) {
      await expect(store.put(key, Buffer.from('x'), 'text/plain')).rejects.toThrow(/bad storage key/);
      await expect(store.get(key)).rejects.toThrow(/bad storage key/);
    }
  });
});

describe('stored files', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => {
    await t?.close();
  });

  it('the API tests keep their files in the bucket, not on the disk', async () => {
    expect(t.config.files.driver).toBe('s3');
    const row = await t.db.db.selectFrom('files').select('storage_path').where('purpose', '=', 'consent_pdf').executeTakeFirstOrThrow();
    expect((await t.storedBytes(row.storage_path)).length).toBeGreaterThan(0);
    expect(await readdir(t.config.storageDir)).toEqual(['mail']);
  });

  it('a sealed file is ciphertext in the store and opens through readStoredFile', async () => {
    const plain = Buffer.from('%PDF-1.7 health answers: reacts to the blue sealer');
    const stored = await t.db.db.transaction().execute((trx) => storeFile(trx, t.ctx.files, { purpose: 'consent_pdf', contentType: 'application/pdf', ext: 'pdf', bytes: plain, sealed: true }));
    const raw = await t.storedBytes(stored.storagePath);
    expect(raw.includes(Buffer.from('blue sealer'))).toBe(false);
    expect(raw.subarray(0, 5).toString('latin1')).not.toBe('%PDF-');
    const back = await readStoredFile(t.db.db, t.ctx.files, stored.id);
    expect(back!.bytes.equals(plain)).toBe(true);
    // Node's own SHA-256 of the plain bytes, as an independent reference for the recorded sum.
    expect(back!.sha256).toBe(createHash('sha256').update(plain).digest('hex'));
  });

  it('a portrait comes back through its authorised route from the bucket, with no bucket address anywhere', async () => {
    const head = await t.sessionFor('head@plinth.test');
    const id = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
    const up = await request(t.app).put(`/api/performers/${id}/portrait`).set('Cookie', head).attach('portrait', await cameraJpeg(), { filename: 'p.jpg', contentType: 'image/jpeg' });
    expect(up.status).toBe(200);
    const file = await t.db.db.selectFrom('performers').innerJoin('files', 'files.id', 'performers.portrait_file_id').select('files.storage_path').where('performers.id', '=', id).executeTakeFirstOrThrow();
    const res = await request(t.app).get(`/api/performers/${id}/portrait`).set('Cookie', head).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => cb(null, Buffer.concat(parts)));
    });
    expect(res.status).toBe(200);
    expect((res.body as Buffer).equals(await t.storedBytes(file.storage_path))).toBe(true);
    const endpoint = new URL(s3Endpoint()).host;
    expect(JSON.stringify([up.headers, up.body, res.headers])).not.toContain(endpoint);
    expect(JSON.stringify(up.body)).not.toContain(t.config.files.driver === 's3' ? t.config.files.bucket : '(none)');
    // Without a session the same bytes are refused.
    expect((await request(t.app).get(`/api/performers/${id}/portrait`)).status).toBe(401);
  });
});

describe('the local disk driver behind the app', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ FILE_STORE: 'local' });
  });
  afterAll(async () => {
    await t?.close();
  });

  it('keeps the demo files under STORAGE_DIR and serves them through the routes', async () => {
    expect(t.config.files).toEqual({ driver: 'local', dir: t.config.storageDir });
    const row = await t.db.db.selectFrom('files').select(['id', 'storage_path']).where('purpose', '=', 'cast_photo').executeTakeFirstOrThrow();
    const [folder, name] = row.storage_path.split('/');
    expect(await readdir(path.join(t.config.storageDir, folder!))).toContain(name);
    const head = await t.sessionFor('head@plinth.test');
    const id = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
    const up = await request(t.app).put(`/api/performers/${id}/portrait`).set('Cookie', head).attach('portrait', await cameraJpeg(), { filename: 'p.jpg', contentType: 'image/jpeg' });
    expect(up.status).toBe(200);
    const res = await request(t.app).get(`/api/performers/${id}/portrait/thumbnail`).set('Cookie', head);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
  });
});
