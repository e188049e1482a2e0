import type { Kysely } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The artist's check finds the lots of each formulation it answers for.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.createIndex('product_lots_formulation_idx').on('product_lots').column('formulation_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex('product_lots_formulation_idx').execute();
}
