/**
 * The artist's check for `npm run bench`: a performer with 200 past patch tests (one product each,
 * read at D2 and D4) and a 30-product kit on The Lantern Keeper, the catalogue topped up to 30 products.
 */
import { sealJson } from '../api/crypto/medical.ts';
import type { Db } from '../api/db/index.ts';

export async function loadCheckData(db: Db, opts: { tests: number; kitSize: number }): Promise<{ performerId: string; productionId: string; kitId: string }> {
  const lantern = await db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  const juno = await db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
  const lead = await db.selectFrom('users').select('id').where('email', '=', 'lead@plinth.test').executeTakeFirstOrThrow();
  const have = await db.selectFrom('products').select('id').execute();
  for (let i = have.length; i < opts.kitSize; i++) {
    const p = await db.insertInto('products').values({ name: `Bench product ${i}`, category: 'other', exposure: 'leave_on' }).returning('id').executeTakeFirstOrThrow();
    const f = await db.insertInto('product_formulations').values({ product_id: p.id, version: 1, inci_label: null }).returning('id').executeTakeFirstOrThrow();
    await db.updateTable('products').set({ current_formulation_id: f.id }).where('id', '=', p.id).execute();
    await db.insertInto('product_lots').values({ product_id: p.id, formulation_id: f.id, code: `BN-${i}`, expires_on: '2030-12-31' }).execute();
  }
  const products = await db.selectFrom('products').select(['id', 'current_formulation_id']).orderBy('name').limit(opts.kitSize).execute();
  const lots = await db.selectFrom('product_lots').select(['id', 'product_id', 'formulation_id']).execute();
  const version = await db.selectFrom('protocol_versions').select('id').where('protocol_id', '=', 'occluded-48h').orderBy('version', 'desc').executeTakeFirstOrThrow();
  const start = Date.UTC(2025, 0, 6, 9);
  for (let i = 0; i < opts.tests; i++) {
    const lot = lots[i % lots.length]!;
    const appliedAt = new Date(start + i * 2 * 86_400_000);
    const booking = await db.insertInto('bookings').values({ performer_id: juno.id, production_id: lantern.id, purpose: 'patch_test', starts_at: appliedAt, location: 'Studio 2', status: 'done', created_by: lead.id }).returning('id').executeTakeFirstOrThrow();
    await db.insertInto('patch_tests').values({ booking_id: booking.id, performer_id: juno.id, production_id: lantern.id, protocol_version_id: version.id, status: 'closed', applied_at: appliedAt, removed_at: new Date(appliedAt.getTime() + 48 * 3600_000), closed_at: new Date(appliedAt.getTime() + 96 * 3600_000) }).execute();
    const tp = await db.insertInto('patch_test_products').values({ test_id: booking.id, position: 0, product_id: lot.product_id, lot_id: lot.id, formulation_id: lot.formulation_id, site: 'Left inner forearm 1' }).returning('id').executeTakeFirstOrThrow();
    const codes = i % 17 === 0 ? ['?+', '-'] : ['-', '-'];
    await db
      .insertInto('patch_test_readings')
      .values([
        { test_product_id: tp.id, point_id: 'd2', read_at: new Date(appliedAt.getTime() + 48.5 * 3600_000), code: sealJson(codes[0]), read_by: lead.id },
        { test_product_id: tp.id, point_id: 'd4', read_at: new Date(appliedAt.getTime() + 96 * 3600_000), code: sealJson(codes[1]), read_by: lead.id },
      ])
      .execute();
  }
  const kit = await db.insertInto('kits').values({ production_id: lantern.id, name: `Bench kit of ${opts.kitSize}` }).returning('id').executeTakeFirstOrThrow();
  await db
    .insertInto('kit_products')
    .values(products.map((p, position) => ({ kit_id: kit.id, position, product_id: p.id })))
    .execute();
  return { performerId: juno.id, productionId: lantern.id, kitId: kit.id };
}
