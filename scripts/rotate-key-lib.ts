// Rotating the medical data key: a new key, every sealed value and file sealed again under it, the old key dropped.
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { readFile, rename, rm, writeFile } from 'node:fs/promises';
import { sql } from 'kysely';
import { previousKeyFile } from '../api/crypto/medical-keys.ts';
import { installKeyring, isSealed, keyringOf, openBytes, openJson, sealBytes, sealedWith, sealJson } from '../api/crypto/medical.ts';
import { SEALED_COLUMNS } from '../api/crypto/sealed-columns.ts';
import type { Db } from '../api/db/index.ts';
import type { FileStore } from '../api/files/store.ts';

export interface RotationReport {
  values: number;
  files: number;
  keyId: string;
}

async function writeSecret(file: string, text: string): Promise<void> {
  const tmp = `${file}.${randomBytes(4).toString('hex')}.part`;
  await writeFile(tmp, text, { mode: 0o600, flag: 'wx' });
  await rename(tmp, file);
}

/**
 * Run with the app stopped. The old key is kept beside the new one until everything is sealed
 * again, so a rotation cut short can be run once more and loses nothing.
 */
export async function rotateMedicalKey(opts: { db: Db; files: FileStore; keyFile: string }): Promise<RotationReport> {
  const old = (await readFile(opts.keyFile, 'utf8')).trim();
  const prevFile = previousKeyFile(opts.keyFile);
  const previous = existsSync(prevFile) ? (await readFile(prevFile, 'utf8')).split('\n').map((l) => l.trim()).filter(Boolean) : [];
  const next = randomBytes(32).toString('base64');
  await writeSecret(prevFile, [...new Set([old, ...previous])].join('\n') + '\n');
  await writeSecret(opts.keyFile, `${next}\n`);
  const ring = keyringOf(next, [old, ...previous]);
  installKeyring(ring);

  let values = 0;
  await opts.db.transaction().execute(async (trx) => {
    for (const c of SEALED_COLUMNS) {
      const { rows } = await sql<{ k: string; v: unknown }>`select ${sql.ref(c.key)}::text as k, ${sql.ref(c.column)} as v from ${sql.table(c.table)} where ${sql.ref(c.column)} is not null`.execute(trx);
      for (const r of rows) {
        if (!isSealed(r.v) || sealedWith(r.v) === ring.current.id) continue;
        const resealed = sealJson(openJson(r.v));
        await sql`update ${sql.table(c.table)} set ${sql.ref(c.column)} = ${c.jsonb ? JSON.stringify(resealed) : resealed}${sql.raw(c.jsonb ? '::jsonb' : '')} where ${sql.ref(c.key)}::text = ${r.k}`.execute(trx);
        values++;
      }
    }
  });

  let files = 0;
  const rows = await opts.db.selectFrom('files').select(['storage_path']).execute();
  for (const f of rows) {
    const bytes = await opts.files.get(f.storage_path);
    if (!bytes) continue;
    const id = sealedWith(bytes);
    if (id === null || id === ring.current.id) continue;
    // Each file is replaced whole (disk: renamed into place; bucket: one PUT), so a reader never sees half.
    await opts.files.put(f.storage_path, sealBytes(openBytes(bytes)), 'application/octet-stream');
    files++;
  }
  // Everything is under the new key: the old one goes.
  await rm(prevFile, { force: true });
  installKeyring(keyringOf(next));
  return { values, files, keyId: ring.current.id };
}
