import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The department's product catalogue (studio-wide, shared by every production) and its test protocols.
// Clearance keys on a formulation: a new formulation of a product is untested again, a new lot is not.
const GROUPS = sql`('acrylates','rosin','latex','rubber_accelerators','fragrance','preservatives','solvents','silicones','pigments','other')`;
const CATEGORIES = sql`('adhesive','remover','sealer','barrier','paint','pigment','silicone','foam_latex','cap_material','cleanser','powder','other')`;
const TEST_KINDS = sql`('department_use','repeated_open','occluded_patch','short_contact')`;

export async function up(db: Kysely<any>): Promise<void> {
  // The vocabulary, keyed by the normalised INCI name; `name_keys` holds the normalised INCI name and every
  // synonym, and no key belongs to two ingredients (checked by the service under a lock, indexed here).
  await db.schema
    .createTable('ingredients')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('inci', 'text', (c) => c.notNull())
    .addColumn('inci_key', 'text', (c) => c.notNull().unique())
    .addColumn('synonyms', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
    .addColumn('name_keys', sql`text[]`, (c) => c.notNull())
    .addColumn('cas', 'text', (c) => c.check(sql`cas is null or cas ~ '^[0-9]{2,7}-[0-9]{2}-[0-9]$'`))
    .addColumn('allergen_group', 'text', (c) => c.notNull().check(sql`allergen_group in ${GROUPS}`))
    .addColumn('trivial', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();
  await sql`create index ingredients_name_keys_idx on ingredients using gin (name_keys)`.execute(db);
  await sql`create unique index ingredients_cas_key on ingredients (cas) where cas is not null`.execute(db);

  await db.schema
    .createTable('products')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('maker', 'text')
    .addColumn('category', 'text', (c) => c.notNull().check(sql`category in ${CATEGORIES}`))
    .addColumn('exposure', 'text', (c) => c.notNull().check(sql`exposure in ('leave_on','rinse_off')`))
    // Material figures for silicones and other mixed materials; optional for every product.
    .addColumn('density_g_per_cm3', 'double precision', (c) => c.check(sql`density_g_per_cm3 is null or (density_g_per_cm3 > 0 and density_g_per_cm3 <= 25)`))
    .addColumn('mix_ratio_a', 'double precision')
    .addColumn('mix_ratio_b', 'double precision')
    .addColumn('max_softener_percent', 'double precision', (c) => c.check(sql`max_softener_percent is null or (max_softener_percent >= 0 and max_softener_percent <= 1000)`))
    .addColumn('current_formulation_id', 'uuid')
    .addColumn('sds_file_id', 'uuid', (c) => c.references('files.id'))
    .addColumn('sds_file_name', 'text')
    .addColumn('sds_uploaded_at', 'timestamptz')
    .addColumn('sds_uploaded_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('products_mix_ratio_check', sql`(mix_ratio_a is null and mix_ratio_b is null) or (mix_ratio_a > 0 and mix_ratio_b > 0)`)
    .execute();
  await sql`create unique index products_name_key on products (lower(name))`.execute(db);

  // A formulation never changes once its ingredients are recorded; a changed label is a new formulation.
  await db.schema
    .createTable('product_formulations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('cascade'))
    .addColumn('version', 'integer', (c) => c.notNull().check(sql`version >= 1`))
    // The list as pasted; null while the ingredients are not recorded.
    .addColumn('inci_label', 'text')
    .addColumn('note', 'text')
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('product_formulations_version_key', ['product_id', 'version'])
    .addUniqueConstraint('product_formulations_product_key', ['id', 'product_id'])
    .execute();
  await sql`alter table products add constraint products_current_formulation_fkey foreign key (current_formulation_id, id) references product_formulations (id, product_id) deferrable initially deferred`.execute(db);

  // In label order; a name the vocabulary lacks is kept with no ingredient, and linked once it is added.
  await db.schema
    .createTable('formulation_ingredients')
    .addColumn('formulation_id', 'uuid', (c) => c.notNull().references('product_formulations.id').onDelete('cascade'))
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('label_name', 'text', (c) => c.notNull())
    .addColumn('ingredient_id', 'uuid', (c) => c.references('ingredients.id'))
    .addColumn('may_contain', 'boolean', (c) => c.notNull().defaultTo(false))
    .addPrimaryKeyConstraint('formulation_ingredients_pkey', ['formulation_id', 'position'])
    .execute();
  await db.schema.createIndex('formulation_ingredients_ingredient_idx').on('formulation_ingredients').column('ingredient_id').execute();
  await sql`create index formulation_ingredients_unlinked_idx on formulation_ingredients (formulation_id) where ingredient_id is null`.execute(db);

  await db.schema
    .createTable('product_lots')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('product_id', 'uuid', (c) => c.notNull().references('products.id').onDelete('cascade'))
    .addColumn('formulation_id', 'uuid', (c) => c.notNull())
    .addColumn('code', 'text', (c) => c.notNull())
    // The last day of use.
    .addColumn('expires_on', 'date', (c) => c.notNull())
    .addColumn('retired_at', 'timestamptz')
    .addColumn('retired_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    // A lot is of one formulation of its own product.
    .addForeignKeyConstraint('product_lots_formulation_fkey', ['formulation_id', 'product_id'], 'product_formulations', ['id', 'product_id'])
    .execute();
  await sql`create unique index product_lots_code_key on product_lots (product_id, lower(code))`.execute(db);

  // A protocol is a slug with a current version; each edit publishes the next version and keeps the old.
  await db.schema
    .createTable('protocols')
    .addColumn('id', 'text', (c) => c.primaryKey().check(sql`id ~ '^[a-z0-9-]{1,60}$'`))
    .addColumn('current_version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createTable('protocol_versions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('protocol_id', 'text', (c) => c.notNull().references('protocols.id'))
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ${TEST_KINDS}`))
    .addColumn('description', 'text', (c) => c.notNull())
    .addColumn('occlusion_minutes', 'integer')
    .addColumn('applications', 'jsonb', (c) => c.notNull())
    .addColumn('readings', 'jsonb', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('protocol_versions_key', ['protocol_id', 'version'])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['protocol_versions', 'protocols', 'product_lots', 'formulation_ingredients']) await db.schema.dropTable(t).execute();
  await sql`alter table products drop constraint products_current_formulation_fkey`.execute(db);
  for (const t of ['product_formulations', 'products', 'ingredients']) await db.schema.dropTable(t).execute();
}
