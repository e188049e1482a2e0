import { sql, type Kysely } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The archive counts a staff member's casts (those of their productions, and of performers engaged on
// them) off the performer and production indexes alone: each carries the columns the list filters by,
// so the count is two index-only scans instead of a visit to every matching cast's row.
const COVERED = 'region, kind, status, current_location_id';

export async function up(db: Kysely<any>): Promise<void> {
  await sql.raw(`create index casts_performer_scope_idx on casts (performer_id) include (production_id, ${COVERED})`).execute(db);
  await sql.raw(`create index casts_production_scope_idx on casts (production_id) include (performer_id, ${COVERED})`).execute(db);
  await sql`drop index casts_performer_id_idx`.execute(db);
  await sql`drop index casts_production_id_idx`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.createIndex('casts_performer_id_idx').on('casts').column('performer_id').execute();
  await db.schema.createIndex('casts_production_id_idx').on('casts').column('production_id').execute();
  await sql`drop index casts_performer_scope_idx`.execute(db);
  await sql`drop index casts_production_scope_idx`.execute(db);
}
