// Patch tests at studio scale: closed tests of five products each, a reading at every reading
// point of the protocol, and one performer (Juno Castellane) with SCALE_JUNO_TESTS tests of a
// 30-product kit, the artist's check's worst case. Reading codes are sealed like real ones.
import type pg from 'pg';
import { sealJson } from '../api/crypto/medical.ts';
import type { IcdrgCode } from '../shared/domain/icdrg.ts';

/** Mostly clear, a few doubtful or irritant, rare positives: the mix a working department sees. */
// common practice, no published source
const CODE_MIX: IcdrgCode[] = [...Array<IcdrgCode>(40).fill('-'), '?+', '?+', 'IR', '+', 'NT', '-', '-', '-', '-', '-'];

export async function loadPatchTests(c: pg.ClientBase, opts: { readings: number; junoTests: number; kitSize: number }): Promise<{ tests: number; readings: number }> {
  const protocol = (await c.query<{ id: string; readings: { id: string; offsetMinutes: number }[] }>(
    `select v.id, v.readings from protocol_versions v where v.kind = 'occluded_patch' order by v.created_at limit 1`,
  )).rows[0];
  if (!protocol) throw new Error('No occluded patch-test protocol: run the default protocols first.');
  const points = protocol.readings.map((r) => r.id);
  const offsets = protocol.readings.map((r) => r.offsetMinutes);
  const perTest = 5;
  const tests = Math.max(opts.junoTests, Math.round(opts.readings / (perTest * points.length)));
  // The app seals every row afresh; here a pool of 200 seals (each with its own IV) is shared across rows, for speed.
  const sealed = Array.from({ length: 200 }, (_, i) => sealJson(CODE_MIX[i % CODE_MIX.length]));
  const juno = (await c.query<{ id: string; production_id: string }>(
    `select p.id, e.production_id from performers p join engagements e on e.performer_id = p.id join productions pr on pr.id = e.production_id
     where p.legal_name = 'Juno Castellane' and pr.name = 'The Lantern Keeper'`,
  )).rows[0];
  if (!juno) throw new Error('The demo performer Juno Castellane is missing: seed the demo scenario first.');
  // Bulk rows go in with the clearance stamps' row triggers off; every performer tested gets a stamp after.
  const stamped = ['patch_tests', 'patch_test_products', 'patch_test_readings'];
  for (const table of stamped) await c.query(`alter table ${table} disable trigger clearance_stamp`);
  try {
    return await insertTests(c, { protocol, points, offsets, perTest, tests, sealed, juno, kitSize: opts.kitSize, junoTests: opts.junoTests });
  } finally {
    for (const table of stamped) await c.query(`alter table ${table} enable trigger clearance_stamp`);
    await c.query(
      `insert into clearance_stamps (key, stamp) select 'performer:' || performer_id, nextval('clearance_stamp_seq') from (select distinct performer_id from patch_tests) p
       on conflict (key) do update set stamp = excluded.stamp`,
    );
  }
}

async function insertTests(
  c: pg.ClientBase,
  { protocol, points, offsets, perTest, tests, sealed, juno, kitSize, junoTests }: { protocol: { id: string }; points: string[]; offsets: number[]; perTest: number; tests: number; sealed: string[]; juno: { id: string; production_id: string }; kitSize: number; junoTests: number },
): Promise<{ tests: number; readings: number }> {
  await c.query(
    `with e as (select array_agg(performer_id order by id) as pids, array_agg(production_id order by id) as prids from engagements)
     insert into bookings (performer_id, production_id, purpose, starts_at, location, status)
     select case when i <= $1 then $2::uuid else e.pids[1 + (i * 37) % cardinality(e.pids)] end,
            case when i <= $1 then $3::uuid else e.prids[1 + (i * 37) % cardinality(e.prids)] end,
            'patch_test', now() - (i % 700) * interval '1 day' - interval '10 days', 'Scale clinic', 'done'
     from e, generate_series(1, $4::int) i`,
    [junoTests, juno.id, juno.production_id, tests],
  );
  await c.query(
    `insert into patch_tests (booking_id, performer_id, production_id, protocol_version_id, status, applied_at, removed_at, closed_at, created_at)
     select b.id, b.performer_id, b.production_id, $1, 'closed', b.starts_at, b.starts_at + interval '48 hours', b.starts_at + interval '5 days', b.starts_at
     from bookings b where b.location = 'Scale clinic'`,
    [protocol.id],
  );
  await c.query(
    `with t as (select booking_id, performer_id, row_number() over (order by booking_id) as n from patch_tests where protocol_version_id = $1 and status = 'closed'
                and booking_id in (select id from bookings where location = 'Scale clinic')),
          kit as (select array_agg(id order by name) as ids from (select id, name from products where name like 'Studio %' order by name limit $3) k),
          everything as (select array_agg(id order by id) as ids from products where current_formulation_id is not null)
     insert into patch_test_products (test_id, position, product_id, lot_id, formulation_id, site)
     select t.booking_id, pos, pick.product_id, lot.id, lot.formulation_id, 'Inner forearm, site ' || (pos + 1)
     from t cross join generate_series(0, ${perTest - 1}) pos cross join kit cross join everything
     cross join lateral (select case when t.performer_id = $2::uuid then kit.ids[1 + ((t.n * ${perTest} + pos) % cardinality(kit.ids))::int]
                                     else everything.ids[1 + ((t.n * 7 + pos * 131) % cardinality(everything.ids))::int] end as product_id) pick
     cross join lateral (select l.id, l.formulation_id from product_lots l where l.product_id = pick.product_id order by l.code limit 1) lot`,
    [protocol.id, juno.id, kitSize],
  );
  const r = await c.query(
    `insert into patch_test_readings (test_product_id, point_id, read_at, code, read_by)
     select tp.id, pt.point, t.applied_at + pt.offset_minutes * interval '1 minute', ($3::text[])[1 + ((hashtext(tp.id::text)::bigint & 2147483647) + pt.k) % cardinality($3::text[])],
            (select user_id from lead_appointments l where l.production_id = t.production_id order by starts_at limit 1)
     from patch_test_products tp join patch_tests t on t.booking_id = tp.test_id
     cross join unnest($1::text[], $2::int[]) with ordinality as pt(point, offset_minutes, k)
     where t.protocol_version_id = $4 and t.booking_id in (select id from bookings where location = 'Scale clinic')`,
    [points, offsets, sealed, protocol.id],
  );
  return { tests, readings: r.rowCount ?? 0 };
}
