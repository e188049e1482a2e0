import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Background jobs: a key per piece of work that must happen at most once (one reminder per cast
// per day), claimed before the work so a second process or a restarted one skips it.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('job_once')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('job', 'text', (c) => c.notNull())
    .addColumn('claimed_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('done_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('job_once_job_idx').on('job_once').columns(['job', 'claimed_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('job_once').execute();
}
