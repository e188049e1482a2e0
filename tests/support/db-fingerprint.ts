// What is in the database, table by table: a row count and a hash of every row, read in one statement.
// Tests compare two fingerprints to prove a refused or rejected request changed nothing.
import type pg from 'pg';

/** Kept out: session rows roll their expiry on every reply; the migrator's own bookkeeping. */
const SKIP = new Set(['sessions']);

export type Fingerprint = Record<string, { rows: number; hash: string }>;

let cachedSql: string | null = null;

async function fingerprintSql(pool: pg.Pool): Promise<string> {
  if (cachedSql) return cachedSql;
  const { rows } = await pool.query<{ tablename: string }>(`select tablename from pg_tables where schemaname = 'public' and tablename not like 'kysely_%' order by tablename`);
  const parts = rows
    .map((r) => r.tablename)
    .filter((n) => !SKIP.has(n))
    .map((n) => `select '${n}' as name, count(*)::int as rows, md5(coalesce(string_agg(md5(x::text), ',' order by md5(x::text)), '')) as hash from public."${n}" x`);
  cachedSql = parts.join(' union all ');
  return cachedSql;
}

export async function fingerprint(pool: pg.Pool): Promise<Fingerprint> {
  const { rows } = await pool.query<{ name: string; rows: number; hash: string }>(await fingerprintSql(pool));
  return Object.fromEntries(rows.map((r) => [r.name, { rows: r.rows, hash: r.hash }]));
}

/** The tables whose rows differ between two fingerprints (empty when nothing changed). */
export function changedTables(before: Fingerprint, after: Fingerprint): string[] {
  const names = new Set([...Object.keys(before), ...Object.keys(after)]);
  return [...names].filter((n) => before[n]?.hash !== after[n]?.hash || before[n]?.rows !== after[n]?.rows).sort();
}
