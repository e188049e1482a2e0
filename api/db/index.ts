import { Kysely, PostgresDialect, type RawBuilder, sql } from 'kysely';
import { createHash } from 'node:crypto';
import pg from 'pg';
import type { Database } from './schema.ts';

// DATE columns stay 'YYYY-MM-DD' strings: turning them into JS Dates shifts them by the time zone.
pg.types.setTypeParser(1082, (v) => v);
// bigint ids (audit log) as strings, never lossy numbers.
pg.types.setTypeParser(20, (v) => v);

export type Db = Kysely<Database>;

/** Fuzzy-match cut-off of name search: a name matches when pg_trgm's word_similarity() is above it. */
export const WORD_SIMILARITY_THRESHOLD = 0.3;

/** The least float4 above `x` (as a float4): one unit in the last place up, for a positive `x`. */
function nextFloat4Above(x: number): number {
  const f = new Float32Array([x]);
  const bits = new Uint32Array(f.buffer);
  bits[0] = bits[0]! + 1;
  return f[0]!;
}

/**
 * The cut-off every connection gives pg_trgm (`pg_trgm.word_similarity_threshold`), so the index-backed
 * `<%` operator means exactly `word_similarity() > WORD_SIMILARITY_THRESHOLD` without a transaction per
 * search. word_similarity() is a float4 and `<%` tests `>=`, so the cut-off is the least float4 above the
 * threshold: with 0.3 itself, every name sharing three of a ten-trigram term's trigrams (similarity 0.3
 * exactly) passes the index and is only dropped by the explicit comparison, hundreds of rows read in vain.
 */
export const WORD_SIMILARITY_INDEX_CUTOFF = nextFloat4Above(WORD_SIMILARITY_THRESHOLD);
/** The cut-off as PostgreSQL reads it back to the same double (17 significant digits). */
export const WORD_SIMILARITY_INDEX_CUTOFF_TEXT = WORD_SIMILARITY_INDEX_CUTOFF.toPrecision(17);

/**
 * Ids as one uuid[] parameter, for `column = any(...)`: PostgreSQL plans one array far better than a
 * list of thousands of parameters, and the statement's text stays the same whatever the count.
 */
export function idArray(ids: Iterable<string>): RawBuilder<string[]> {
  return sql<string[]>`${[...new Set(ids)]}::uuid[]`;
}

/** Statements with at most this many parameters are prepared on each connection; longer lists stay one-off. */
export const PREPARE_MAX_PARAMS = 24;
const statementNames = new Map<string, string>();

function statementName(text: string): string {
  let name = statementNames.get(text);
  if (!name) {
    name = `plinth_${createHash('sha1').update(text).digest('hex').slice(0, 24)}`;
    // Bounded: a name costs a hash to work out again, never a wrong answer.
    if (statementNames.size >= 5000) statementNames.clear();
    statementNames.set(text, name);
  }
  return name;
}

/**
 * A connection that prepares each parameterised statement once, by a hash of its text: PostgreSQL then
 * parses and plans it once per connection (and settles on a generic plan when that is as good), where
 * planning cost more than running for most of Plinth's short reads. Statements without parameters
 * (which may hold several commands) and those with long parameter lists (a new text per length) go as
 * before. The prototype's query is looked up on each call, so a wrapper installed later still sees it.
 */
class PreparingClient extends pg.Client {}
(PreparingClient.prototype as unknown as { query: (...args: unknown[]) => unknown }).query = function (this: pg.Client, ...args: unknown[]) {
  const base = pg.Client.prototype.query as unknown as (...a: unknown[]) => unknown;
  const [text, values, callback] = args;
  if (typeof text === 'string' && Array.isArray(values) && values.length > 0 && values.length <= PREPARE_MAX_PARAMS && callback === undefined) {
    return base.call(this, { name: statementName(text), text, values });
  }
  return base.apply(this, args);
};

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
    options: `-c pg_trgm.word_similarity_threshold=${WORD_SIMILARITY_INDEX_CUTOFF_TEXT} -c jit=off`,
    Client: PreparingClient,
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
