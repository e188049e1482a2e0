import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Rate-limit counters shared by every API process: one row per limiter and client key, counting
// the hits of the current window, which ends at reset_at.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('rate_limit_hits')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('hits', 'integer', (c) => c.notNull())
    .addColumn('reset_at', 'timestamptz', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('rate_limit_hits_reset_idx').on('rate_limit_hits').column('reset_at').execute();
  await sql`comment on table rate_limit_hits is 'Rate-limit counters per limiter and client address; rows past reset_at are stale and swept'`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('rate_limit_hits').execute();
}
