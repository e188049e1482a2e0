import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`create extension if not exists pgcrypto`.execute(db);

  await db.schema
    .createTable('users')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('display_name', 'text', (c) => c.notNull())
    .addColumn('is_admin', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('oidc_issuer', 'text')
    .addColumn('oidc_subject', 'text')
    .addColumn('last_sign_in_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();
  await sql`create unique index users_email_key on users (lower(email))`.execute(db);
  await sql`create unique index users_oidc_key on users (oidc_issuer, oidc_subject) where oidc_subject is not null`.execute(db);

  await db.schema
    .createTable('productions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('name', 'text', (c) => c.notNull())
    .addColumn('kind', 'text', (c) => c.notNull().check(sql`kind in ('film','television','stage','other')`))
    .addColumn('starts_on', 'date')
    .addColumn('ends_on', 'date')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .addCheckConstraint('productions_dates_check', sql`ends_on is null or starts_on is null or ends_on >= starts_on`)
    .execute();
  await sql`create unique index productions_name_key on productions (lower(name))`.execute(db);

  await db.schema
    .createTable('memberships')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('head','artist','archivist','performer')`))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('memberships_user_production_role_key', ['user_id', 'production_id', 'role'])
    .execute();
  await db.schema.createIndex('memberships_production_idx').on('memberships').column('production_id').execute();

  // The designated lead is an appointment with history; at most one open appointment per production.
  await db.schema
    .createTable('lead_appointments')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('users.id'))
    .addColumn('starts_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('ends_at', 'timestamptz')
    .addColumn('appointed_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('ended_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addCheckConstraint('lead_appointments_period_check', sql`ends_at is null or ends_at >= starts_at`)
    .execute();
  await sql`create unique index lead_appointments_open_key on lead_appointments (production_id) where ends_at is null`.execute(
    db,
  );

  // Studio-wide performer registry; details grow with the performer feature.
  await db.schema
    .createTable('performers')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('legal_name', 'text', (c) => c.notNull())
    .addColumn('preferred_name', 'text')
    .addColumn('email', 'text')
    .addColumn('user_id', 'uuid', (c) => c.references('users.id').onDelete('set null').unique())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();

  await db.schema
    .createTable('engagements')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('character_name', 'text')
    .addColumn('starts_on', 'date')
    .addColumn('ends_on', 'date')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('engagements_performer_production_key', ['performer_id', 'production_id'])
    .execute();
  await db.schema.createIndex('engagements_production_idx').on('engagements').column('production_id').execute();

  // Server-side sessions (the express-session store's own layout).
  await db.schema
    .createTable('sessions')
    .addColumn('sid', 'varchar', (c) => c.primaryKey())
    .addColumn('sess', 'json', (c) => c.notNull())
    .addColumn('expire', sql`timestamp(6)`, (c) => c.notNull())
    .execute();
  await db.schema.createIndex('sessions_expire_idx').on('sessions').column('expire').execute();

  await db.schema
    .createTable('audit_log')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('actor_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('entity_type', 'text', (c) => c.notNull())
    .addColumn('entity_id', 'text')
    .addColumn('production_id', 'uuid', (c) => c.references('productions.id').onDelete('set null'))
    .addColumn('details', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .addColumn('ip', 'text')
    .execute();
  await db.schema.createIndex('audit_log_at_idx').on('audit_log').column('at').execute();
  await db.schema.createIndex('audit_log_entity_idx').on('audit_log').columns(['entity_type', 'entity_id']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['audit_log', 'sessions', 'engagements', 'performers', 'lead_appointments', 'memberships', 'productions', 'users']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
}
