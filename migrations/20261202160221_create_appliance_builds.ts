import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Appliance builds: runs of pieces poured from a performer's mold, each material with its lot and the
// formulation that lot was of, every piece counted, and the shoot days planned for each appliance.
const ROLES = sql`('part_a','part_b','softener','pigment','flocking','cap_material','solvent','release_agent')`;

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('appliance_builds')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    // The mold's performer, kept on the build so a performer's builds are found without the archive.
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('mold_id', 'uuid', (c) => c.notNull().references('casts.id').onDelete('restrict'))
    .addColumn('made_on', 'date', (c) => c.notNull())
    .addColumn('made_by', 'text', (c) => c.notNull())
    // The weigh-out as asked for and as worked out, and what the scale showed.
    .addColumn('mix_input', 'jsonb', (c) => c.notNull())
    .addColumn('mix_plan', 'jsonb', (c) => c.notNull())
    .addColumn('weighed', 'jsonb', (c) => c.notNull())
    .addColumn('coating_input', 'jsonb')
    .addColumn('coating_volumes', 'jsonb')
    .addColumn('cure_minutes', 'integer', (c) => c.notNull().check(sql`cure_minutes > 0`))
    .addColumn('notes', 'text')
    .addColumn('photo_file_id', 'uuid', (c) => c.references('files.id').onDelete('restrict'))
    .addColumn('photo_thumb_file_id', 'uuid', (c) => c.references('files.id').onDelete('restrict'))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('appliance_builds_photo_pair', sql`(photo_file_id is null) = (photo_thumb_file_id is null)`)
    .execute();
  await sql`create index appliance_builds_production_idx on appliance_builds (production_id, made_on desc)`.execute(db);
  await db.schema.createIndex('appliance_builds_performer_idx').on('appliance_builds').column('performer_id').execute();
  await db.schema.createIndex('appliance_builds_mold_idx').on('appliance_builds').columns(['mold_id', 'production_id']).execute();

  await db.schema
    .createTable('appliance_build_materials')
    .addColumn('build_id', 'uuid', (c) => c.notNull().references('appliance_builds.id').onDelete('cascade'))
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ${ROLES}`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('restrict'))
    .addColumn('lot_id', 'uuid', (c) => c.notNull().references('product_lots.id').onDelete('restrict'))
    // Clearance keys on a formulation: the lot's, as it was when the build was recorded, of the same product.
    .addColumn('formulation_id', 'uuid', (c) => c.notNull())
    .addPrimaryKeyConstraint('appliance_build_materials_pkey', ['build_id', 'position'])
    .addForeignKeyConstraint('appliance_build_materials_formulation_fkey', ['formulation_id', 'product_id'], 'product_formulations', ['id', 'product_id'])
    .execute();
  await db.schema.createIndex('appliance_build_materials_lot_idx').on('appliance_build_materials').column('lot_id').execute();

  await db.schema
    .createTable('appliance_pieces')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('build_id', 'uuid', (c) => c.notNull().references('appliance_builds.id').onDelete('cascade'))
    .addColumn('number', 'integer', (c) => c.notNull().check(sql`number >= 1`))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('on_hand').check(sql`status in ('on_hand','used','spoiled')`))
    // The logged application the piece was worn for; applications are not logged yet, so no foreign key.
    .addColumn('application_id', 'uuid')
    .addColumn('status_at', 'timestamptz')
    .addColumn('status_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('note', 'text')
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addUniqueConstraint('appliance_pieces_number_key', ['build_id', 'number'])
    .addCheckConstraint('appliance_pieces_application_when_used', sql`application_id is null or status = 'used'`)
    .execute();

  await db.schema
    .createTable('appliance_plans')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('mold_id', 'uuid', (c) => c.notNull().references('casts.id').onDelete('restrict'))
    .addColumn('shoot_days_planned', 'integer', (c) => c.notNull().check(sql`shoot_days_planned >= 0`))
    .addColumn('spares', 'jsonb', (c) => c.notNull())
    .addColumn('pieces_per_day', 'integer', (c) => c.notNull().defaultTo(1).check(sql`pieces_per_day >= 1`))
    .addColumn('updated_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addUniqueConstraint('appliance_plans_mold_key', ['production_id', 'mold_id'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['appliance_plans', 'appliance_pieces', 'appliance_build_materials', 'appliance_builds']) await db.schema.dropTable(t).execute();
}
