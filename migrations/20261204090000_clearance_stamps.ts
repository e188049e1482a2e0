import { sql, type Kysely } from 'kysely';

// Frozen in time: takes Kysely<any>, never imports app code.
// Stamps for what a performer's clearance is decided from, so an API process may keep what it read and
// know, in one cheap lookup, whether it is still true. Triggers take a fresh number from one sequence
// whenever a row changes that clearance reads: 'performer:<id>' for that performer's patch tests, tested
// products, readings and session status; 'catalogue' for products, formulations, their ingredient rows,
// the ingredient vocabulary and protocol versions. The sequence belongs to no column, so emptying the
// tables never hands out a number twice; a key with no row has no stamp and is never cached.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`create sequence clearance_stamp_seq`.execute(db);
  await db.schema
    .createTable('clearance_stamps')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('stamp', 'bigint', (c) => c.notNull())
    .execute();
  await sql`create function bump_clearance_stamp(k text) returns void language sql as $$
    insert into clearance_stamps (key, stamp) values (k, nextval('clearance_stamp_seq'))
    on conflict (key) do update set stamp = excluded.stamp
  $$`.execute(db);

  // A performer's own rows, row by row (each change says whose it is).
  await sql`create function clearance_stamp_of_test() returns trigger language plpgsql as $$
  begin
    if tg_op <> 'INSERT' then perform bump_clearance_stamp('performer:' || old.performer_id); end if;
    if tg_op <> 'DELETE' then perform bump_clearance_stamp('performer:' || new.performer_id); end if;
    return null;
  end $$`.execute(db);
  await sql`create function clearance_stamp_of_test_product() returns trigger language plpgsql as $$
  begin
    if tg_op <> 'INSERT' then
      perform bump_clearance_stamp('performer:' || t.performer_id) from patch_tests t where t.booking_id = old.test_id;
    end if;
    if tg_op <> 'DELETE' then
      perform bump_clearance_stamp('performer:' || t.performer_id) from patch_tests t where t.booking_id = new.test_id;
    end if;
    return null;
  end $$`.execute(db);
  await sql`create function clearance_stamp_of_reading() returns trigger language plpgsql as $$
  begin
    if tg_op <> 'INSERT' then
      perform bump_clearance_stamp('performer:' || t.performer_id)
        from patch_test_products tp join patch_tests t on t.booking_id = tp.test_id where tp.id = old.test_product_id;
    end if;
    if tg_op <> 'DELETE' then
      perform bump_clearance_stamp('performer:' || t.performer_id)
        from patch_test_products tp join patch_tests t on t.booking_id = tp.test_id where tp.id = new.test_product_id;
    end if;
    return null;
  end $$`.execute(db);
  await sql`create function clearance_stamp_of_booking() returns trigger language plpgsql as $$
  begin
    perform bump_clearance_stamp('performer:' || old.performer_id);
    perform bump_clearance_stamp('performer:' || new.performer_id);
    return null;
  end $$`.execute(db);
  await sql`create trigger clearance_stamp after insert or update or delete on patch_tests for each row execute function clearance_stamp_of_test()`.execute(db);
  await sql`create trigger clearance_stamp after insert or update or delete on patch_test_products for each row execute function clearance_stamp_of_test_product()`.execute(db);
  await sql`create trigger clearance_stamp after insert or update or delete on patch_test_readings for each row execute function clearance_stamp_of_reading()`.execute(db);
  // A session's status says whether its test was cancelled; a session is removed only with its test.
  await sql`create trigger clearance_stamp after update of status, performer_id on bookings for each row
    when (old.status is distinct from new.status or old.performer_id is distinct from new.performer_id)
    execute function clearance_stamp_of_booking()`.execute(db);

  // The catalogue and protocols, once a statement: edits there are rare and clear everything kept.
  await sql`create function clearance_stamp_of_catalogue() returns trigger language plpgsql as $$
  begin
    perform bump_clearance_stamp('catalogue');
    return null;
  end $$`.execute(db);
  for (const table of ['products', 'product_formulations', 'formulation_ingredients', 'ingredients', 'protocol_versions']) {
    await sql`create trigger clearance_stamp after insert or update or delete or truncate on ${sql.table(table)} for each statement execute function clearance_stamp_of_catalogue()`.execute(db);
  }

  // What is there already gets its first stamps.
  await sql`insert into clearance_stamps (key, stamp) select 'performer:' || performer_id, nextval('clearance_stamp_seq') from (select distinct performer_id from patch_tests) p`.execute(db);
  await sql`select bump_clearance_stamp('catalogue')`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of ['products', 'product_formulations', 'formulation_ingredients', 'ingredients', 'protocol_versions', 'bookings', 'patch_test_readings', 'patch_test_products', 'patch_tests']) {
    await sql`drop trigger clearance_stamp on ${sql.table(table)}`.execute(db);
  }
  for (const fn of ['clearance_stamp_of_catalogue', 'clearance_stamp_of_booking', 'clearance_stamp_of_reading', 'clearance_stamp_of_test_product', 'clearance_stamp_of_test']) {
    await sql`drop function ${sql.raw(fn)}()`.execute(db);
  }
  await sql`drop function bump_clearance_stamp(text)`.execute(db);
  await db.schema.dropTable('clearance_stamps').execute();
  await sql`drop sequence clearance_stamp_seq`.execute(db);
}
