import { type Kysely, sql } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
//
// A session keeps, beside the user's permissions, what the session screen shows of them: their name
// and address and the names of the productions they work on. So users.access_version also moves when
// a user's name or address changes, and for every member and lead of a production when its name does.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create function users_stamp_profile() returns trigger language plpgsql as $$
    begin
      new.access_version := nextval('users_access_version_seq');
      return new;
    end $$`.execute(db);
  await sql`create trigger users_stamp_profile before update of email, display_name on users
    for each row when (old.email is distinct from new.email or old.display_name is distinct from new.display_name)
    execute function users_stamp_profile()`.execute(db);

  await sql`
    create function productions_stamp_people() returns trigger language plpgsql as $$
    begin
      update users set access_version = nextval('users_access_version_seq')
      where id in (
        select m.user_id from memberships m where m.production_id = new.id
        union select l.user_id from lead_appointments l where l.production_id = new.id
      );
      return null;
    end $$`.execute(db);
  await sql`create trigger productions_stamp_people after update of name on productions
    for each row when (old.name is distinct from new.name) execute function productions_stamp_people()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop trigger if exists productions_stamp_people on productions`.execute(db);
  await sql`drop function if exists productions_stamp_people()`.execute(db);
  await sql`drop trigger if exists users_stamp_profile on users`.execute(db);
  await sql`drop function if exists users_stamp_profile()`.execute(db);
}
