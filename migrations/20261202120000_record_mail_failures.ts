import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Mail that follows a committed change and could not be sent: kept so an administrator sees it and can send it again.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('mail_failures')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('message', 'jsonb', (c) => c.notNull())
    .addColumn('recipients', 'text', (c) => c.notNull())
    .addColumn('subject', 'text', (c) => c.notNull())
    .addColumn('error', 'text', (c) => c.notNull())
    .addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('failed_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('sent_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('mail_failures_open_idx').on('mail_failures').column('failed_at').where(sql.ref('sent_at'), 'is', null).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('mail_failures').execute();
}
