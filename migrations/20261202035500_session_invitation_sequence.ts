import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Each session's calendar invitation keeps one UID for its life; its SEQUENCE counts the changes sent since.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable('bookings')
    .addColumn('invitation_sequence', 'integer', (c) => c.notNull().defaultTo(0).check(sql`invitation_sequence >= 0`))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('bookings').dropColumn('invitation_sequence').execute();
}
