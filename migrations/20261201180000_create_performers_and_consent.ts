import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`create extension if not exists pg_trgm`.execute(db);

  // Every stored file (portraits, signatures, consent PDFs); bytes live under storage/, named by id.
  await db.schema
    .createTable('files')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('purpose', 'text', (c) => c.notNull())
    .addColumn('content_type', 'text', (c) => c.notNull())
    .addColumn('byte_size', 'integer', (c) => c.notNull())
    .addColumn('sha256', 'text', (c) => c.notNull())
    .addColumn('storage_path', 'text', (c) => c.notNull().unique())
    .addColumn('width', 'integer')
    .addColumn('height', 'integer')
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('files_sha256_idx').on('files').column('sha256').execute();

  await db.schema
    .alterTable('performers')
    .addColumn('pronouns', 'text')
    .addColumn('phone', 'text')
    .addColumn('emergency_contact_name', 'text')
    .addColumn('emergency_contact_phone', 'text')
    .addColumn('agent_name', 'text')
    .addColumn('agent_contact', 'text')
    .addColumn('notes', 'text')
    .addColumn('portrait_file_id', 'uuid', (c) => c.references('files.id').onDelete('set null'))
    .addColumn('portrait_thumb_file_id', 'uuid', (c) => c.references('files.id').onDelete('set null'))
    .execute();
  await sql`create index performers_name_trgm_idx on performers using gin ((coalesce(preferred_name, '') || ' ' || legal_name) gin_trgm_ops)`.execute(db);
  await sql`create unique index performers_email_key on performers (lower(email)) where email is not null`.execute(db);

  await db.schema
    .createTable('consent_templates')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('kind', 'text', (c) =>
      c.notNull().check(sql`kind in ('life_casting','patch_testing','application','cast_storage','health_data')`),
    )
    .addColumn('current_version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('archived', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  // A published version never changes; editing a template publishes the next version.
  await db.schema
    .createTable('consent_template_versions')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('template_id', 'uuid', (c) => c.notNull().references('consent_templates.id').onDelete('cascade'))
    .addColumn('version', 'integer', (c) => c.notNull())
    .addColumn('title', 'text', (c) => c.notNull())
    .addColumn('body', 'text', (c) => c.notNull())
    .addColumn('questions', 'jsonb', (c) => c.notNull().defaultTo(sql`'[]'::jsonb`))
    .addColumn('validity_days', 'integer', (c) => c.check(sql`validity_days is null or validity_days > 0`))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addUniqueConstraint('consent_template_versions_key', ['template_id', 'version'])
    .execute();

  await db.schema
    .createTable('signing_requests')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.references('productions.id').onDelete('set null'))
    .addColumn('template_id', 'uuid', (c) => c.notNull().references('consent_templates.id'))
    .addColumn('mode', 'text', (c) => c.notNull().check(sql`mode in ('tablet','link')`))
    .addColumn('token_hash', 'text', (c) => c.unique())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('open').check(sql`status in ('open','signed','cancelled')`))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('opened_at', 'timestamptz')
    .addColumn('signed_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('signing_requests_performer_idx').on('signing_requests').column('performer_id').execute();

  await db.schema
    .createTable('consents')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.references('productions.id').onDelete('set null'))
    .addColumn('template_version_id', 'uuid', (c) => c.notNull().references('consent_template_versions.id'))
    .addColumn('kind', 'text', (c) => c.notNull())
    .addColumn('request_id', 'uuid', (c) => c.references('signing_requests.id').onDelete('set null'))
    .addColumn('idempotency_key', 'uuid', (c) => c.notNull().unique())
    .addColumn('signer_name', 'text', (c) => c.notNull())
    .addColumn('signed_at', 'timestamptz', (c) => c.notNull())
    .addColumn('expires_at', 'timestamptz')
    .addColumn('signing_method', 'text', (c) => c.notNull().check(sql`signing_method in ('tablet','link')`))
    .addColumn('ip', 'text')
    .addColumn('user_agent', 'text')
    .addColumn('staff_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('signature_file_id', 'uuid', (c) => c.notNull().references('files.id'))
    .addColumn('pdf_file_id', 'uuid', (c) => c.notNull().references('files.id'))
    .addColumn('pdf_sha256', 'text', (c) => c.notNull().unique())
    .addColumn('content_sha256', 'text', (c) => c.notNull())
    .addColumn('withdrawn_at', 'timestamptz')
    .addColumn('withdrawn_by_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('withdrawn_via', 'text', (c) => c.check(sql`withdrawn_via is null or withdrawn_via in ('performer','lead','link')`))
    .addColumn('withdrawal_reason', 'text')
    .addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
    .execute();
  await db.schema.createIndex('consents_performer_idx').on('consents').columns(['performer_id', 'kind']).execute();

  // Answers to the questionnaire; `medical` answers are health data, open only to the lead and the performer.
  await db.schema
    .createTable('consent_answers')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('consent_id', 'uuid', (c) => c.notNull().references('consents.id').onDelete('cascade'))
    .addColumn('question_id', 'text', (c) => c.notNull())
    .addColumn('question_label', 'text', (c) => c.notNull())
    .addColumn('medical', 'boolean', (c) => c.notNull())
    .addColumn('answer', 'jsonb', (c) => c.notNull())
    .addUniqueConstraint('consent_answers_key', ['consent_id', 'question_id'])
    .execute();

  await db.schema
    .createTable('withdrawal_links')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('used_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  // Upcoming sessions that need a consent in place (patch tests, life casts, applications).
  await db.schema
    .createTable('bookings')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('production_id', 'uuid', (c) => c.notNull().references('productions.id').onDelete('cascade'))
    .addColumn('purpose', 'text', (c) => c.notNull().check(sql`purpose in ('patch_test','life_cast','application')`))
    .addColumn('starts_at', 'timestamptz', (c) => c.notNull())
    .addColumn('location', 'text')
    .addColumn('status', 'text', (c) => c.notNull().defaultTo('booked').check(sql`status in ('booked','cancelled','done')`))
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex('bookings_production_start_idx').on('bookings').columns(['production_id', 'starts_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['bookings', 'withdrawal_links', 'consent_answers', 'consents', 'signing_requests', 'consent_template_versions', 'consent_templates']) {
    await db.schema.dropTable(t).ifExists().execute();
  }
  await sql`drop index if exists performers_name_trgm_idx`.execute(db);
  await sql`drop index if exists performers_email_key`.execute(db);
  for (const c of ['pronouns', 'phone', 'emergency_contact_name', 'emergency_contact_phone', 'agent_name', 'agent_contact', 'notes', 'portrait_file_id', 'portrait_thumb_file_id']) {
    await db.schema.alterTable('performers').dropColumn(c).execute();
  }
  await db.schema.dropTable('files').ifExists().execute();
}
