import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The production and role each person last chose to act in, so the next sign-in lands there; and
// an index to find the production a person last worked on from the audit log when they never chose.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('user_last_seats')
    .addColumn('user_id', 'uuid', (c) => c.primaryKey().references('users.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.references('productions.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull())
    .addColumn('chosen_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('audit_log_actor_idx').on('audit_log').columns(['actor_user_id', 'at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex('audit_log_actor_idx').execute();
  await db.schema.dropTable('user_last_seats').execute();
}
