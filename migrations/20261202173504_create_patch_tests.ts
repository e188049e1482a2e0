import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Patch tests: a session (booking) of purpose patch_test with the protocol version it was booked on,
// its tested products (product, lot and the lot's formulation, and the site each went on), a reading
// per tested product and reading point (code and note sealed), reading photos (sealed files), and the
// lead's clearance overrides (note sealed).

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('patch_tests')
    .addColumn('booking_id', 'uuid', (c) => c.primaryKey().references('bookings.id').onDelete('restrict'))
    // Kept beside the booking so the performer's tests are found without going through sessions.
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    .addColumn('protocol_version_id', 'uuid', (c) => c.notNull().references('protocol_versions.id').onDelete('restrict'))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('booked').check(sql`status in ('booked','applied','closed','cancelled')`))
    .addColumn('applied_at', 'timestamptz')
    .addColumn('applied_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('removed_at', 'timestamptz')
    .addColumn('closed_at', 'timestamptz')
    .addColumn('closed_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('cancelled_at', 'timestamptz')
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('patch_tests_applied', sql`(status = 'booked') or (status = 'cancelled') or applied_at is not null`)
    .addCheckConstraint('patch_tests_removed_after_applied', sql`removed_at is null or (applied_at is not null and removed_at >= applied_at)`)
    .execute();
  await db.schema.createIndex('patch_tests_performer_idx').on('patch_tests').columns(['performer_id', 'status']).execute();
  await db.schema.createIndex('patch_tests_production_idx').on('patch_tests').columns(['production_id', 'status']).execute();

  await db.schema
    .createTable('patch_test_products')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('test_id', 'uuid', (c) => c.notNull().references('patch_tests.booking_id').onDelete('cascade'))
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('restrict'))
    .addColumn('lot_id', 'uuid', (c) => c.notNull().references('product_lots.id').onDelete('restrict'))
    // Clearance keys on a formulation: the lot's, of the same product.
    .addColumn('formulation_id', 'uuid', (c) => c.notNull())
    .addColumn('site', 'text', (c) => c.notNull())
    .addForeignKeyConstraint('patch_test_products_formulation_fkey', ['formulation_id', 'product_id'], 'product_formulations', ['id', 'product_id'])
    .addUniqueConstraint('patch_test_products_position_key', ['test_id', 'position'])
    .addUniqueConstraint('patch_test_products_site_key', ['test_id', 'site'])
    .execute();
  await db.schema.createIndex('patch_test_products_formulation_idx').on('patch_test_products').column('formulation_id').execute();

  await db.schema
    .createTable('patch_test_readings')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('test_product_id', 'uuid', (c) => c.notNull().references('patch_test_products.id').onDelete('cascade'))
    .addColumn('point_id', 'text', (c) => c.notNull())
    .addColumn('read_at', 'timestamptz', (c) => c.notNull())
    // Sealed (AES-256-GCM) health details: the ICDRG code and the reader's note.
    .addColumn('code', 'text', (c) => c.notNull())
    .addColumn('note', 'text')
    .addColumn('late', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('read_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('patch_test_readings_point_key', ['test_product_id', 'point_id'])
    .execute();

  await db.schema
    .createTable('patch_test_photos')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('reading_id', 'uuid', (c) => c.notNull().references('patch_test_readings.id').onDelete('cascade'))
    .addColumn('file_id', 'uuid', (c) => c.notNull().references('files.id').onDelete('restrict'))
    .addColumn('thumb_file_id', 'uuid', (c) => c.notNull().references('files.id').onDelete('restrict'))
    .addColumn('width', 'integer', (c) => c.notNull())
    .addColumn('height', 'integer', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('patch_test_photos_reading_idx').on('patch_test_photos').column('reading_id').execute();

  await db.schema
    .createTable('clearance_overrides')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    .addColumn('formulation_id', 'uuid', (c) => c.notNull().references('product_formulations.id').onDelete('restrict'))
    .addColumn('state', 'text', (c) => c.notNull().check(sql`state in ('cleared','caution','do_not_use','untested')`))
    // Sealed (AES-256-GCM): the lead's reason.
    .addColumn('note', 'text', (c) => c.notNull())
    .addColumn('expires_at', 'timestamptz')
    .addColumn('set_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('set_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('clearance_overrides_performer_idx').on('clearance_overrides').columns(['performer_id', 'formulation_id', 'set_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['clearance_overrides', 'patch_test_photos', 'patch_test_readings', 'patch_test_products', 'patch_tests']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
}
