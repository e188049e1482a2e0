// Sealing every health detail again under the current key: the key rotation's work, and the pass
// that seals values a migration left in plain text (a column that became sealed after it had rows).
import { sql } from 'kysely';
import type { Db } from '../db/index.ts';
import type { FileStore } from '../files/drivers.ts';
import { currentKeyId, isSealed, openBytes, openJson, sealBytes, sealedWith, sealJson } from './medical.ts';
import { sealedTables } from './sealed-columns.ts';

export interface ResealReport {
  /** Values sealed (again) in the database. */
  values: number;
  /** Stored files sealed again. */
  files: number;
}

/**
 * Every value of every sealed column that is not under the current key (sealed under an older one,
 * or still plain) is sealed under the current key: one transaction per table, its rows locked.
 * `onlyPlain` touches only values still in plain text (the start-up pass: it reads no sealed row).
 */
export async function resealColumns(db: Db, opts: { onlyPlain?: boolean } = {}): Promise<number> {
  const current = currentKeyId();
  let values = 0;
  for (const t of sealedTables()) {
    values += await db.transaction().execute(async (trx) => {
      let n = 0;
      for (const c of t.columns) {
        const filter = c.where ? sql` and ${sql.ref(c.where)}` : sql``;
        const plain = opts.onlyPlain ? sql` and ${sql.ref(c.column)}::text not like ${c.jsonb ? '"sealed:v1:%' : 'sealed:v1:%'}` : sql``;
        const { rows } = await sql<{ k: string; v: unknown }>`select ${sql.ref(t.key)}::text as k, ${sql.ref(c.column)} as v from ${sql.table(t.table)} where ${sql.ref(c.column)} is not null${filter}${plain} for update`.execute(trx);
        for (const r of rows) {
          if (isSealed(r.v) && sealedWith(r.v) === current) continue;
          const resealed = sealJson(openJson(r.v));
          await sql`update ${sql.table(t.table)} set ${sql.ref(c.column)} = ${c.jsonb ? JSON.stringify(resealed) : resealed}${sql.raw(c.jsonb ? '::jsonb' : '')} where ${sql.ref(t.key)}::text = ${r.k}`.execute(trx);
          n++;
        }
      }
      return n;
    });
  }
  return values;
}

/** Every sealed stored file (signed copies with health answers, reading photos) not under the current key, sealed again. */
export async function resealFiles(db: Db, files: FileStore): Promise<number> {
  const current = currentKeyId();
  let n = 0;
  const rows = await db.selectFrom('files').select(['storage_path']).execute();
  for (const f of rows) {
    const bytes = await files.get(f.storage_path);
    if (!bytes) continue;
    const id = sealedWith(bytes);
    if (id === null || id === current) continue;
    // Each file is replaced whole (disk: renamed into place; bucket: one PUT), so a reader never sees half.
    await files.put(f.storage_path, sealBytes(openBytes(bytes)), 'application/octet-stream');
    n++;
  }
  return n;
}

/** Both: what a rotation runs once the new key is installed (and the old one kept to open with). */
export async function resealAll(db: Db, files: FileStore): Promise<ResealReport> {
  const values = await resealColumns(db);
  return { values, files: await resealFiles(db, files) };
}
