// Bench data for patch tests: 200 past tests (three products, two readings each) of one performer, and
// 60 tests under reading across other performers for the lead's home. Bulk inserts, outside any timing.
import { randomUUID } from 'node:crypto';
import { sealJson } from '../api/crypto/medical.ts';
import type { Db } from '../api/db/index.ts';

const HOUR = 3_600_000;
const CODES = ['-', '-', '-', '?+', '+', 'IR'];

export async function loadBenchPatchTests(db: Db, v: { productionId: string; performerId: string; otherPerformerIds: readonly string[]; past: number; underReading: number }): Promise<void> {
  const occluded = await db.selectFrom('protocol_versions').select('id').where('protocol_id', '=', 'occluded-48h').orderBy('version', 'desc').executeTakeFirstOrThrow();
  const lots = await db.selectFrom('product_lots').select(['id', 'product_id', 'formulation_id']).where('retired_at', 'is', null).execute();
  const now = Date.now();
  const tests: { id: string; performerId: string; at: Date; closed: boolean }[] = [];
  for (let i = 0; i < v.past; i++) tests.push({ id: randomUUID(), performerId: v.performerId, at: new Date(now - (v.past - i) * 3 * 24 * HOUR), closed: true });
  for (let i = 0; i < v.underReading; i++) tests.push({ id: randomUUID(), performerId: v.otherPerformerIds[i % v.otherPerformerIds.length]!, at: new Date(now - (50 + (i % 48)) * HOUR), closed: false });
  for (let i = 0; i < tests.length; i += 200) {
    const chunk = tests.slice(i, i + 200);
    await db.insertInto('bookings').values(chunk.map((t) => ({ id: t.id, performer_id: t.performerId, production_id: v.productionId, purpose: 'patch_test' as const, starts_at: t.at, location: 'Bench room', status: 'done' as const }))).execute();
    await db
      .insertInto('patch_tests')
      .values(
        chunk.map((t) => ({
          booking_id: t.id,
          performer_id: t.performerId,
          production_id: v.productionId,
          protocol_version_id: occluded.id,
          status: t.closed ? ('closed' as const) : ('applied' as const),
          applied_at: t.at,
          removed_at: new Date(t.at.getTime() + 48 * HOUR),
          closed_at: t.closed ? new Date(t.at.getTime() + 100 * HOUR) : null,
        })),
      )
      .execute();
    const products = chunk.flatMap((t, n) =>
      [0, 1, 2].map((k) => {
        const lot = lots[(i + n * 3 + k) % lots.length]!;
        return { id: randomUUID(), test: t, row: { test_id: t.id, position: k, product_id: lot.product_id, lot_id: lot.id, formulation_id: lot.formulation_id, site: `Left inner forearm ${k + 1}` } };
      }),
    );
    await db.insertInto('patch_test_products').values(products.map((p) => ({ id: p.id, ...p.row }))).execute();
    const readings = products.flatMap((p, n) =>
      p.test.closed
        ? [
            { test_product_id: p.id, point_id: 'd2', read_at: new Date(p.test.at.getTime() + 48.5 * HOUR), code: sealJson(CODES[n % CODES.length]) },
            { test_product_id: p.id, point_id: 'd4', read_at: new Date(p.test.at.getTime() + 96 * HOUR), code: sealJson(CODES[(n + 1) % CODES.length]) },
          ]
        : [],
    );
    if (readings.length) await db.insertInto('patch_test_readings').values(readings).execute();
  }
}
