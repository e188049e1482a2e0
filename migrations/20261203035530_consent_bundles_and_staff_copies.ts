import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Several forms asked for at once (one hand-over, or one e-mailed link that walks through them),
// a second rendering of each consent without health answers, what staff last looked at, and the
// end, place and artist of a session.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('signing_bundles')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.references('productions.id').onDelete('set null'))
    .addColumn('mode', 'text', (c) => c.notNull().check(sql`mode in ('tablet','link')`))
    .addColumn('token_hash', 'text', (c) => c.unique())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .alterTable('signing_requests')
    .addColumn('bundle_id', 'uuid', (c) => c.references('signing_bundles.id').onDelete('cascade'))
    .addColumn('bundle_position', 'integer')
    .execute();
  await sql`alter table signing_requests add constraint signing_requests_bundle_position_chk check ((bundle_id is null) = (bundle_position is null))`.execute(db);
  await db.schema.createIndex('signing_requests_bundle_idx').on('signing_requests').columns(['bundle_id', 'bundle_position']).unique().execute();

  await db.schema
    .alterTable('consents')
    .addColumn('staff_pdf_file_id', 'uuid', (c) => c.references('files.id'))
    .addColumn('staff_pdf_sha256', 'text', (c) => c.unique())
    .execute();

  // When a staff member last looked at a list on their home ("withdrawn since you last looked").
  await db.schema
    .createTable('staff_seen')
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('topic', 'text', (c) => c.notNull().check(sql`topic in ('withdrawals')`))
    .addColumn('seen_at', 'timestamptz', (c) => c.notNull())
    .addPrimaryKeyConstraint('staff_seen_pk', ['user_id', 'production_id', 'topic'])
    .execute();

  // The designated lead confirms having looked at a performer's health answers on a production.
  await db.schema
    .createTable('health_reviews')
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('reviewed_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('reviewed_at', 'timestamptz', (c) => c.notNull())
    .addPrimaryKeyConstraint('health_reviews_pk', ['performer_id', 'production_id'])
    .execute();

  await db.schema
    .alterTable('bookings')
    .addColumn('ends_at', 'timestamptz')
    .addColumn('artist_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .execute();
  await sql`alter table bookings add constraint bookings_ends_after_start_chk check (ends_at is null or ends_at > starts_at)`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table bookings drop constraint bookings_ends_after_start_chk`.execute(db);
  await db.schema.alterTable('bookings').dropColumn('artist_user_id').dropColumn('ends_at').execute();
  await db.schema.dropTable('health_reviews').execute();
  await db.schema.dropTable('staff_seen').execute();
  await db.schema.alterTable('consents').dropColumn('staff_pdf_sha256').dropColumn('staff_pdf_file_id').execute();
  await db.schema.alterTable('signing_requests').dropColumn('bundle_position').dropColumn('bundle_id').execute();
  await db.schema.dropTable('signing_bundles').execute();
}
