import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Kits of products per production; the artist's checks before an application and the requests to the
// lead they raise; the application log with its products and lots; the skin check after removal and
// the incident anything but clear opens. Health details (observations, the lead's notes) are sealed text.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('kits')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('updated_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();
  await sql`create unique index kits_name_key on kits (production_id, lower(name))`.execute(db);
  await db.schema
    .createTable('kit_products')
    .addColumn('kit_id', 'uuid', (c) => c.notNull().references('kits.id').onDelete('cascade'))
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('restrict'))
    .addPrimaryKeyConstraint('kit_products_pkey', ['kit_id', 'position'])
    .addUniqueConstraint('kit_products_product_key', ['kit_id', 'product_id'])
    .execute();

  await db.schema
    .createTable('clearance_checks')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('kit_id', 'uuid', (c) => c.references('kits.id').onDelete('set null'))
    .addColumn('run_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('run_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    // The answers as shown (states, reasons in plain words, validity), never a grade or a note.
    .addColumn('items', 'jsonb', (c) => c.notNull())
    .addColumn('piece_ids', sql`uuid[]`, (c) => c.notNull().defaultTo(sql`'{}'`))
    .execute();
  await sql`create index clearance_checks_performer_idx on clearance_checks (performer_id, run_at desc)`.execute(db);

  await db.schema
    .createTable('lead_requests')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('check_id', 'uuid', (c) => c.notNull().references('clearance_checks.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('restrict'))
    .addColumn('formulation_id', 'uuid', (c) => c.notNull())
    .addColumn('state_at_request', 'text', (c) => c.notNull().check(sql`state_at_request in ('caution','do_not_use')`))
    .addColumn('requested_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('requested_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('waiting').check(sql`status in ('waiting','approved','refused')`))
    .addColumn('decided_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('decided_at', 'timestamptz')
    // The lead's note is a health detail: sealed.
    .addColumn('decision_note', 'text')
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addForeignKeyConstraint('lead_requests_formulation_fkey', ['formulation_id', 'product_id'], 'product_formulations', ['id', 'product_id'])
    .addUniqueConstraint('lead_requests_one_per_product', ['check_id', 'formulation_id'])
    .addCheckConstraint('lead_requests_decided', sql`(status = 'waiting') = (decided_at is null)`)
    .execute();
  await sql`create index lead_requests_waiting_idx on lead_requests (production_id) where status = 'waiting'`.execute(db);
  await sql`create index lead_requests_performer_idx on lead_requests (performer_id, formulation_id)`.execute(db);

  await db.schema
    .createTable('applications')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('check_id', 'uuid', (c) => c.notNull().references('clearance_checks.id').onDelete('restrict'))
    .addColumn('artist_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('applied_on', 'date', (c) => c.notNull())
    .addColumn('description', 'text')
    .addColumn('started_at', 'timestamptz', (c) => c.notNull())
    .addColumn('ended_at', 'timestamptz')
    .addColumn('notes', 'text')
    // The check's answer at the moment of logging, frozen.
    .addColumn('check_snapshot', 'jsonb', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('applications_end_after_start', sql`ended_at is null or ended_at >= started_at`)
    .execute();
  await sql`create index applications_production_day_idx on applications (production_id, applied_on desc)`.execute(db);
  await db.schema.createIndex('applications_performer_idx').on('applications').column('performer_id').execute();

  await db.schema
    .createTable('application_products')
    .addColumn('application_id', 'uuid', (c) => c.notNull().references('applications.id').onDelete('cascade'))
    .addColumn('use', 'text', (c) => c.notNull().check(sql`use in ('applied','removal')`))
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('restrict'))
    .addColumn('lot_id', 'uuid', (c) => c.notNull().references('product_lots.id').onDelete('restrict'))
    .addColumn('formulation_id', 'uuid', (c) => c.notNull())
    .addPrimaryKeyConstraint('application_products_pkey', ['application_id', 'use', 'position'])
    .addForeignKeyConstraint('application_products_formulation_fkey', ['formulation_id', 'product_id'], 'product_formulations', ['id', 'product_id'])
    .execute();
  await db.schema.createIndex('application_products_lot_idx').on('application_products').column('lot_id').execute();

  await sql`alter table appliance_pieces add constraint appliance_pieces_application_fkey foreign key (application_id) references applications (id) on delete set null`.execute(db);
  await db.schema.createIndex('appliance_pieces_application_idx').on('appliance_pieces').column('application_id').execute();

  await db.schema
    .createTable('skin_checks')
    .addColumn('application_id', 'uuid', (c) => c.primaryKey().references('applications.id').onDelete('cascade'))
    .addColumn('outcome', 'text', (c) => c.notNull().check(sql`outcome in ('clear','redness','reaction')`))
    // A health detail: sealed.
    .addColumn('observation', 'text')
    .addColumn('checked_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('checked_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint('skin_checks_observation', sql`outcome = 'clear' or observation is not null`)
    .execute();

  await db.schema
    .createTable('incidents')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('application_id', 'uuid', (c) => c.notNull().unique().references('applications.id').onDelete('restrict'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('restrict'))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('restrict'))
    .addColumn('reported_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('reported_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('open').check(sql`status in ('open','closed')`))
    .addColumn('closed_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('closed_at', 'timestamptz')
    // The lead's closing note is a health detail: sealed.
    .addColumn('closing_note', 'text')
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();
  await sql`create index incidents_open_idx on incidents (production_id) where status = 'open'`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`alter table appliance_pieces drop constraint appliance_pieces_application_fkey`.execute(db);
  await db.schema.dropIndex('appliance_pieces_application_idx').execute();
  for (const t of ['incidents', 'skin_checks', 'application_products', 'applications', 'lead_requests', 'clearance_checks', 'kit_products', 'kits']) await db.schema.dropTable(t).execute();
}
