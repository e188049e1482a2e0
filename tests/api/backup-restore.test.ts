import { openBytes } from '../../api/crypto/medical.ts';
import { createHash, randomBytes } from 'node:crypto';
import { promises as fs } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backup, restore, rowCounts } from '../../scripts/backup-lib.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { adminUrl } from '../support/db.ts';

let source: TestApp;
let restored: TestApp | undefined;
let work: string;
const emptyDb = `plinth_restore_${randomBytes(4).toString('hex')}`;

async function admin(sqlText: string) {
  const c = new pg.Client({ connectionString: adminUrl() });
  await c.connect();
  try {
    await c.query(sqlText);
  } finally {
    await c.end();
  }
}

beforeAll(async () => {
  // The archive copies files on this machine's disk: both apps keep theirs there.
  source = await createTestApp({ FILE_STORE: 'local' });
  work = await fs.mkdtemp(path.join(os.tmpdir(), 'plinth-backup-test-'));
  await admin(`create database ${emptyDb} template template0`);
});
afterAll(async () => {
  await restored?.close();
  await source?.close();
  await admin(`drop database if exists ${emptyDb} with (force)`);
  await fs.rm(work, { recursive: true, force: true });
});

async function sha256sOf(dir: string, skip: string[]): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  async function walk(at: string) {
    for (const e of await fs.readdir(at, { withFileTypes: true })) {
      const full = path.join(at, e.name);
      const rel = path.relative(dir, full);
      if (e.isDirectory()) {
        if (!skip.includes(rel)) await walk(full);
      } else if (!e.name.startsWith('.')) {
        out.set(rel, createHash('sha256').update(await fs.readFile(full)).digest('hex'));
      }
    }
  }
  await walk(dir);
  return out;
}

describe('backup and restore', () => {
  it('restores into an empty cluster database with the same rows in every table and the same bytes in every file, and a signed PDF still verifies', async () => {
    const file = path.join(work, 'plinth.tar.gz');
    const manifest = await backup({ databaseUrl: source.db.url, storageDir: source.config.storageDir, out: file });
    expect(manifest.files.length).toBeGreaterThan(10);
    expect(manifest.tables.consents).toBeGreaterThan(5);

    const storage = path.join(work, 'restored-storage');
    await fs.mkdir(storage);
    const report = await restore({ databaseUrl: adminUrl(emptyDb), storageDir: storage, file });
    expect(report.tableMismatches).toEqual([]);
    expect(report.fileMismatches).toEqual([]);

    // Compared independently of the manifest: every table's count, every file's SHA-256.
    expect(await rowCounts(adminUrl(emptyDb))).toEqual(await rowCounts(source.db.url));
    expect(await sha256sOf(storage, [])).toEqual(await sha256sOf(source.config.storageDir, ['mail']));

    // The restored app recognises a consent PDF it issued before the backup.
    restored = await createTestApp({ FILE_STORE: 'local', DATABASE_URL: adminUrl(emptyDb), STORAGE_DIR: storage, MEDICAL_DATA_KEY: source.config.medicalDataKey! }, { seed: false, database: adminUrl(emptyDb) });
    const c = await restored.db.db.selectFrom('consents').innerJoin('files', 'files.id', 'consents.pdf_file_id').select(['consents.id', 'files.storage_path']).executeTakeFirstOrThrow();
    const pdf = openBytes(await fs.readFile(path.join(storage, c.storage_path)));
    const check = await request(restored.app).post('/api/consents/verify').set('Cookie', await restored.sessionFor('head@plinth.test')).attach('file', pdf, 'consent.pdf');
    expect(check.status).toBe(200);
    expect(check.body).toMatchObject({ match: true, consent: { id: c.id } });
  });

  it('refuses to restore over a database that has data', async () => {
    await expect(restore({ databaseUrl: source.db.url, storageDir: path.join(work, 'elsewhere'), file: path.join(work, 'plinth.tar.gz') })).rejects.toThrow(/not empty/);
  });
});
