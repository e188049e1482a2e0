import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createDb, type DbHandle } from '../../api/db/index.ts';

export const TEMPLATE_DB = 'plinth_template';

/** The throwaway cluster `npm test` started; never the development one. */
export function adminUrl(database = 'postgres'): string {
  const base = process.env.TEST_DATABASE_URL;
  if (!base) throw new Error('TEST_DATABASE_URL is not set: run the tests with `npm test`, which starts a throwaway PostgreSQL.');
  const url = new URL(base);
  url.pathname = `/${database}`;
  return url.href;
}

async function adminQuery(sqlText: string): Promise<void> {
  const c = new pg.Client({ connectionString: adminUrl() });
  await c.connect();
  try {
    await c.query(sqlText);
  } finally {
    await c.end();
  }
}

export interface TestDb extends DbHandle {
  name: string;
  url: string;
  drop(): Promise<void>;
}

/** A fresh, migrated database for one test file, cloned from the template. */
export async function createTestDb(): Promise<TestDb> {
  const name = `plinth_t_${randomBytes(5).toString('hex')}`;
  await adminQuery(`create database ${name} template ${TEMPLATE_DB}`);
  const url = adminUrl(name);
  const handle = createDb(url, { max: 5, log: () => {} });
  return {
    ...handle,
    name,
    url,
    async drop() {
      await handle.close();
      await adminQuery(`drop database if exists ${name} with (force)`);
    },
  };
}

/** Empties every table but the migration bookkeeping, for tests that need a clean slate. */
export async function truncateAll(handle: DbHandle): Promise<void> {
  const { rows } = await handle.pool.query<{ tablename: string }>(
    `select tablename from pg_tables where schemaname = 'public' and tablename not like 'kysely_%'`,
  );
  if (!rows.length) return;
  // The audit log refuses truncation to everyone, the app included; a test's clean slate switches triggers off for itself.
  const c = await handle.pool.connect();
  try {
    await c.query('begin');
    await c.query('set local session_replication_role = replica');
    await c.query(`truncate ${rows.map((r) => `"${r.tablename}"`).join(', ')} restart identity cascade`);
    await c.query('commit');
  } catch (err) {
    await c.query('rollback');
    throw err;
  } finally {
    c.release();
  }
}
