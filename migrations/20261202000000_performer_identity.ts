import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// A performer's contact address and sign-in are the performer's: staff may enter an address, but it
// carries nothing of the performer's until the performer confirms it, and a sign-in is linked only
// on the performer's own proof.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('performers').addColumn('email_confirmed_at', 'timestamptz').execute();
  // Whatever path changes the address, the confirmation of the old one does not carry over.
  await sql`
    create function performers_email_unconfirm() returns trigger language plpgsql as $$
    begin
      if new.email is distinct from old.email and new.email_confirmed_at is not distinct from old.email_confirmed_at then
        new.email_confirmed_at := null;
      end if;
      return new;
    end $$`.execute(db);
  await sql`create trigger performers_email_unconfirm before update of email on performers for each row execute function performers_email_unconfirm()`.execute(db);

  await db.schema
    .createTable('email_confirmations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('used_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('email_confirmations_performer_idx').on('email_confirmations').columns(['performer_id', 'created_at']).execute();

  await db.schema
    .createTable('account_invitations')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('performer_id', 'uuid', (c) => c.notNull().references('performers.id').onDelete('cascade'))
    .addColumn('email', 'text', (c) => c.notNull())
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('expires_at', 'timestamptz', (c) => c.notNull())
    .addColumn('created_by', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('accepted_at', 'timestamptz')
    .addColumn('accepted_user_id', 'uuid', (c) => c.references('users.id').onDelete('set null'))
    .execute();
  await db.schema.createIndex('account_invitations_performer_idx').on('account_invitations').columns(['performer_id', 'created_at']).execute();

  // Acts a performer does without a sign-in (through a link) name the performer as the actor.
  await db.schema.alterTable('audit_log').addColumn('actor_performer_id', 'uuid', (c) => c.references('performers.id').onDelete('set null')).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('audit_log').dropColumn('actor_performer_id').execute();
  await db.schema.dropTable('account_invitations').execute();
  await db.schema.dropTable('email_confirmations').execute();
  await sql`drop trigger performers_email_unconfirm on performers`.execute(db);
  await sql`drop function performers_email_unconfirm()`.execute(db);
  await db.schema.alterTable('performers').dropColumn('email_confirmed_at').execute();
}
