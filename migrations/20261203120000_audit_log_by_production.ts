import type { Kysely } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// A designated lead reads the audit log of the productions they lead, newest first: an index on the
// production each entry belongs to (written with the entry by every change that belongs to one).
// The column has been on every entry from the start, so there is nothing to fill in, and the
// append-only triggers stay as they are.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.createIndex('audit_log_production_idx').on('audit_log').columns(['production_id', 'at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropIndex('audit_log_production_idx').execute();
}
