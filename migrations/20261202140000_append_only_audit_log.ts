import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// The audit log is history: the database itself refuses to change or remove an entry, whoever asks.
export async function up(db: Kysely<any>): Promise<void> {
  // Whose record an entry is about, and which route made it, so a performer can read who looked at their health data.
  await db.schema.alterTable('audit_log').addColumn('subject_performer_id', 'uuid').addColumn('route', 'text').execute();
  await db.schema.createIndex('audit_log_subject_idx').on('audit_log').columns(['subject_performer_id', 'at']).execute();
  // Keys to people and productions stay as plain ids: removing a record must not rewrite its history.
  for (const fk of ['audit_log_actor_user_id_fkey', 'audit_log_production_id_fkey', 'audit_log_actor_performer_id_fkey']) {
    await sql`alter table audit_log drop constraint if exists ${sql.ref(fk)}`.execute(db);
  }
  await sql`
    create function audit_log_refuse_change() returns trigger language plpgsql as $$
    begin
      raise exception 'the audit log is append-only: % is refused', tg_op using errcode = '42501';
    end $$`.execute(db);
  await sql`create trigger audit_log_append_only before update or delete on audit_log for each row execute function audit_log_refuse_change()`.execute(db);
  await sql`create trigger audit_log_no_truncate before truncate on audit_log for each statement execute function audit_log_refuse_change()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger audit_log_no_truncate on audit_log`.execute(db);
  await sql`drop trigger audit_log_append_only on audit_log`.execute(db);
  await sql`drop function audit_log_refuse_change()`.execute(db);
  await db.schema.dropIndex('audit_log_subject_idx').execute();
  await db.schema.alterTable('audit_log').dropColumn('route').dropColumn('subject_performer_id').execute();
}
