import { Kysely, PostgresDialect, type RawBuilder, sql } from 'kysely';
import pg from 'pg';
import type { Database } from './schema.ts';

// DATE columns stay 'YYYY-MM-DD' strings: turning them into JS Dates shifts them by the time zone.
pg.types.setTypeParser(1082, (v) => v);
// bigint ids (audit log) as strings, never lossy numbers.
pg.types.setTypeParser(20, (v) => v);

export type Db = Kysely<Database>;

/**
 * Fuzzy-match cut-off for pg_trgm's word similarity, set on every connection so the index-backed
 * `<%` operator and an explicit word_similarity() comparison agree without a transaction per search.
 */
export const WORD_SIMILARITY_THRESHOLD = 0.3;

/**
 * Ids as one uuid[] parameter, for `column = any(...)`: PostgreSQL plans one array far better than a
 * list of thousands of parameters, and the statement's text stays the same whatever the count.
 */
export function idArray(ids: Iterable<string>): RawBuilder<string[]> {
  return sql<string[]>`${[...new Set(ids)]}::uuid[]`;
}

export interface DbHandle {
  db: Db;
  pool: pg.Pool;
  close(): Promise<void>;
}

/** One pool per process; idle-client errors (database restarted) are logged, not fatal. */
export function createDb(databaseUrl: string, opts: { max?: number; log?: (msg: string) => void } = {}): DbHandle {
  const pool = new pg.Pool({
    connectionString: databaseUrl,
    // The trigram cut-off of name search, and no JIT: Plinth's queries are short and index-backed, and
    // compiling one to machine code costs more than it saves.
    options: `-c pg_trgm.word_similarity_threshold=${WORD_SIMILARITY_THRESHOLD} -c jit=off`,
    max: opts.max ?? 10,
    connectionTimeoutMillis: 5000,
    idleTimeoutMillis: 30_000,
  });
  pool.on('error', (err) => (opts.log ?? console.error)(`database connection lost: ${err.message}`));
  const db = new Kysely<Database>({ dialect: new PostgresDialect({ pool }) });
  return {
    db,
    pool,
    async close() {
      await db.destroy();
    },
  };
}
