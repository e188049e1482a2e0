import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
//
// users.access_version changes whenever anything that decides what a user may do changes, so a
// session can keep the user's permissions and check one number per request. The stamp is drawn
// from a sequence, not counted up per user, so a value is never handed out twice, even when rows
// are restored from a copy.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`create sequence users_access_version_seq`.execute(db);
  await db.schema.alterTable('users').addColumn('access_version', 'bigint', (c) => c.notNull().defaultTo(0)).execute();

  await sql`
    create function users_stamp_access() returns trigger language plpgsql as $$
    begin
      if tg_op in ('UPDATE', 'DELETE') and old.user_id is not null then
        update users set access_version = nextval('users_access_version_seq') where id = old.user_id;
      end if;
      if tg_op = 'INSERT' or (tg_op = 'UPDATE' and new.user_id is distinct from old.user_id) then
        if new.user_id is not null then
          update users set access_version = nextval('users_access_version_seq') where id = new.user_id;
        end if;
      end if;
      return null;
    end $$`.execute(db);
  await sql`
    create function users_stamp_all_access() returns trigger language plpgsql as $$
    begin
      update users set access_version = nextval('users_access_version_seq');
      return null;
    end $$`.execute(db);
  await sql`
    create function users_stamp_admin_flag() returns trigger language plpgsql as $$
    begin
      new.access_version := nextval('users_access_version_seq');
      return new;
    end $$`.execute(db);

  for (const table of ['memberships', 'lead_appointments']) {
    await sql`create trigger ${sql.id(`${table}_stamp_access`)} after insert or update or delete on ${sql.table(table)}
      for each row execute function users_stamp_access()`.execute(db);
    await sql`create trigger ${sql.id(`${table}_stamp_access_truncate`)} after truncate on ${sql.table(table)}
      for each statement execute function users_stamp_all_access()`.execute(db);
  }
  // Only the link to a sign-in matters on a performer record; edits of names and contacts do not.
  await sql`create trigger performers_stamp_access_insert after insert on performers
    for each row when (new.user_id is not null) execute function users_stamp_access()`.execute(db);
  await sql`create trigger performers_stamp_access_update after update of user_id on performers
    for each row when (old.user_id is distinct from new.user_id) execute function users_stamp_access()`.execute(db);
  await sql`create trigger performers_stamp_access_delete after delete on performers
    for each row when (old.user_id is not null) execute function users_stamp_access()`.execute(db);
  await sql`create trigger performers_stamp_access_truncate after truncate on performers
    for each statement execute function users_stamp_all_access()`.execute(db);
  await sql`create trigger users_stamp_admin_flag before update of is_admin on users
    for each row when (old.is_admin is distinct from new.is_admin) execute function users_stamp_admin_flag()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger if exists users_stamp_admin_flag on users`.execute(db);
  for (const name of ['insert', 'update', 'delete', 'truncate']) {
    await sql`drop trigger if exists ${sql.id(`performers_stamp_access_${name}`)} on performers`.execute(db);
  }
  for (const table of ['memberships', 'lead_appointments']) {
    await sql`drop trigger if exists ${sql.id(`${table}_stamp_access`)} on ${sql.table(table)}`.execute(db);
    await sql`drop trigger if exists ${sql.id(`${table}_stamp_access_truncate`)} on ${sql.table(table)}`.execute(db);
  }
  await sql`drop function if exists users_stamp_admin_flag()`.execute(db);
  await sql`drop function if exists users_stamp_all_access()`.execute(db);
  await sql`drop function if exists users_stamp_access()`.execute(db);
  await db.schema.alterTable('users').dropColumn('access_version').execute();
  await sql`drop sequence if exists users_access_version_seq`.execute(db);
}
