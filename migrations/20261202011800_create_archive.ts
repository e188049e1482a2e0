import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The life-cast archive: storage places as a tree, casts with one current place each, every
// movement and condition check kept, and photos.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('archive_locations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    // restrict: a place that still holds places is never removed from under them.
    .addColumn('parent_id', 'uuid', (c) => c.references('archive_locations.id').onDelete('restrict'))
    .addColumn('level', 'text', (c) => c.notNull().check(sql`level in ('site','room','rack','shelf','bin')`))
    .addColumn('code', 'text', (c) => c.notNull().check(sql`code ~ '^[A-Z0-9]([A-Z0-9-]{0,8}[A-Z0-9])?$'`))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('environment', 'text')
    .addColumn('label_code', 'text', (c) => c.notNull().unique())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('archive_locations_not_own_parent', sql`parent_id is null or parent_id <> id`)
    .execute();
  // Codes are unique among siblings (top-level places included), so a code path names one place.
  await sql`alter table archive_locations add constraint archive_locations_sibling_code_key unique nulls not distinct (parent_id, code)`.execute(db);
  await db.schema.createIndex('archive_locations_code_idx').on('archive_locations').column('code').execute();

  await db.schema
    .createTable('casts')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('label_code', 'text', (c) => c.notNull().unique())
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    .addColumn('region', 'text', (c) => c.notNull().check(sql`region in ('face','head','head_and_shoulders','torso','arm','hand','leg','foot','teeth','other')`))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('mold','positive','core','other')`))
    .addColumn('material', 'text', (c) => c.notNull())
    .addColumn('made_on', 'date', (c) => c.notNull())
    .addColumn('made_by', 'text', (c) => c.notNull())
    .addColumn('poured_from_id', 'uuid', (c) => c.references('casts.id').onDelete('restrict'))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('in_store').check(sql`status in ('in_store','checked_out','on_loan','returned_to_performer','destroyed')`))
    .addColumn('normal_location_id', 'uuid', (c) => c.references('archive_locations.id').onDelete('restrict'))
    // One current place per cast: a storage place, a person, another production, or none (returned or destroyed).
    .addColumn('current_location_id', 'uuid', (c) => c.references('archive_locations.id').onDelete('restrict'))
    .addColumn('current_holder', 'text')
    .addColumn('current_holder_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('current_production', 'text')
    .addColumn('due_back_at', 'timestamptz')
    .addColumn('since', 'timestamptz', (c) => c.notNull())
    .addColumn('notes', 'text')
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint(
      'casts_one_current_place',
      sql`(status = 'in_store') = (current_location_id is not null)
        and (status = 'checked_out') = (current_holder is not null)
        and (status = 'on_loan') = (current_production is not null)
        and (current_holder_user_id is null or status = 'checked_out')`,
    )
    .addCheckConstraint('casts_due_only_when_out', sql`due_back_at is null or status in ('checked_out','on_loan')`)
    .addCheckConstraint('casts_not_own_source', sql`poured_from_id is null or poured_from_id <> id`)
    .execute();
  for (const column of ['performer_id', 'production_id', 'current_location_id', 'normal_location_id', 'poured_from_id', 'region', 'kind', 'status']) {
    await db.schema.createIndex(`casts_${column}_idx`).on('casts').column(column).execute();
  }
  // The list's default order, newest first, read straight off an index.
  await sql`create index casts_made_on_idx on casts (made_on desc, label_code)`.execute(db);
  await sql`create index casts_out_due_idx on casts (due_back_at) where status in ('checked_out','on_loan')`.execute(db);
  // Search by production name is a term like any other: trigram-indexed like performers' names.
  await sql`create index productions_name_trgm_idx on productions using gin (name gin_trgm_ops)`.execute(db);

  await db.schema
    .createTable('cast_movements')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('cast_id', 'uuid', (c) => c.notNull().references('casts.id').onDelete('cascade'))
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('check_out','check_in','relocation','loan','return_to_performer','destruction')`))
    .addColumn('at', 'timestamptz', (c) => c.notNull())
    .addColumn('moved_by', 'text', (c) => c.notNull())
    .addColumn('authorised_by', 'text', (c) => c.notNull())
    // Places as recorded, with their names at the time, so the history still reads after a place is renamed or removed.
    .addColumn('from_place', 'jsonb', (c) => c.notNull())
    .addColumn('to_place', 'jsonb', (c) => c.notNull())
    .addColumn('from_label', 'text', (c) => c.notNull())
    .addColumn('to_label', 'text', (c) => c.notNull())
    .addColumn('status_before', 'text', (c) => c.notNull())
    .addColumn('status_after', 'text', (c) => c.notNull())
    .addColumn('normal_before', 'uuid')
    .addColumn('normal_after', 'uuid')
    .addColumn('reason', 'text')
    .addColumn('due_back_at', 'timestamptz')
    .addColumn('witness', 'text')
    .addColumn('method', 'text')
    .addColumn('contact', 'text')
    .addColumn('note', 'text')
    .addColumn('holder_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('recorded_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('cast_movements_destruction_witnessed', sql`kind <> 'destruction' or (witness is not null and reason is not null and lower(witness) <> lower(moved_by))`)
    .execute();
  await db.schema.createIndex('cast_movements_cast_idx').on('cast_movements').columns(['cast_id', 'at']).execute();

  await db.schema
    .createTable('cast_condition_checks')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('cast_id', 'uuid', (c) => c.notNull().references('casts.id').onDelete('cascade'))
    .addColumn('checked_on', 'date', (c) => c.notNull())
    .addColumn('checked_by', 'text', (c) => c.notNull())
    .addColumn('grade', 'text', (c) => c.notNull().check(sql`grade in ('good','fair','poor','damaged')`))
    .addColumn('notes', 'text')
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('cast_condition_checks_cast_idx').on('cast_condition_checks').columns(['cast_id', 'checked_on']).execute();

  await db.schema
    .createTable('cast_photos')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('cast_id', 'uuid', (c) => c.notNull().references('casts.id').onDelete('cascade'))
    .addColumn('condition_check_id', 'uuid', (c) => c.references('cast_condition_checks.id').onDelete('set null'))
    .addColumn('file_id', 'uuid', (c) => c.notNull().references('files.id').onDelete('restrict'))
    .addColumn('thumb_file_id', 'uuid', (c) => c.notNull().references('files.id').onDelete('restrict'))
    .addColumn('width', 'integer', (c) => c.notNull())
    .addColumn('height', 'integer', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('cast_photos_cast_idx').on('cast_photos').columns(['cast_id', 'created_at']).execute();
  await db.schema.createIndex('cast_photos_check_idx').on('cast_photos').column('condition_check_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('cast_photos').execute();
  await db.schema.dropTable('cast_condition_checks').execute();
  await db.schema.dropTable('cast_movements').execute();
  await sql`drop index productions_name_trgm_idx`.execute(db);
  await db.schema.dropTable('casts').execute();
  await db.schema.dropTable('archive_locations').execute();
}
