import type { Kysely } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.createIndex('bookings_performer_start_idx').on('bookings').columns(['performer_id', 'starts_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex('bookings_performer_start_idx').execute();
}
