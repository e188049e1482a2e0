import { sealJson } from '../crypto/medical.ts';
import type { Db } from './index.ts';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** One demo test: who, on which protocol, its stage, and each lot with its site and the codes read at each point. */
interface DemoTest {
  performer: string;
  protocol: 'occluded-48h' | 'department-use' | 'short-contact';
  /** Start (and, once applied, application) this many hours from now. */
  atHours: number;
  location: string;
  status: 'booked' | 'applied' | 'closed';
  /** Hours after application the patches came off (occluded tests). */
  removedAfterHours?: number;
  items: { lot: string; site: string; readings?: { point: string; afterHours: number; code: string; note?: string }[] }[];
}

/**
 * Tests at every stage for several performers of The Lantern Keeper (all invented): booked and waiting for
 * a consent, under reading with a reading due now and one overdue, cleared, one doubtful (?+ at the final
 * reading), one allergic (++), and a sealer sharing the allergic adhesive's acrylates copolymer.
 */
const DEMO_TESTS: DemoTest[] = [
  { performer: 'Halvard Imre Solberg', protocol: 'department-use', atHours: 3 * 24 + 8.5, location: 'Make-up room 2', status: 'booked', items: [{ lot: 'QA-2609', site: 'Left inner forearm 1' }] },
  {
    performer: 'Juno Castellane',
    protocol: 'occluded-48h',
    atHours: -60 * 24,
    location: 'Make-up room 1',
    status: 'closed',
    removedAfterHours: 48,
    items: ['PR-2602', 'TC-2603', 'SP-2606'].map((lot, i) => ({
      lot,
      site: `Left inner forearm ${i + 1}`,
      readings: [
        { point: 'd2', afterHours: 48.5, code: '-' },
        { point: 'd4', afterHours: 96, code: '-' },
      ],
    })),
  },
  {
    performer: 'Juno Castellane',
    protocol: 'department-use',
    atHours: -26,
    location: 'Make-up room 1',
    status: 'applied',
    items: [
      { lot: 'MS-2604', site: 'Right inner forearm 1' },
      { lot: 'DB-2602', site: 'Right inner forearm 2' },
    ],
  },
  {
    performer: 'Oswin Parfitt-Reyes',
    protocol: 'occluded-48h',
    atHours: -21 * 24,
    location: 'Make-up room 2',
    status: 'closed',
    removedAfterHours: 48,
    items: [
      {
        lot: 'QA-2602',
        site: 'Upper back, left 1',
        readings: [
          { point: 'd2', afterHours: 48.5, code: '+', note: 'Redness with firm raised skin over the whole patch.' },
          { point: 'd4', afterHours: 96, code: '++', note: 'Small blisters at the centre; performer told to keep it covered.' },
        ],
      },
      {
        lot: 'GG-2601',
        site: 'Upper back, left 2',
        readings: [
          { point: 'd2', afterHours: 48.5, code: '-' },
          { point: 'd4', afterHours: 96, code: '?+', note: 'Faint pink only.' },
        ],
      },
      {
        lot: 'PR-2602',
        site: 'Upper back, left 3',
        readings: [
          { point: 'd2', afterHours: 48.5, code: '-' },
          { point: 'd4', afterHours: 96, code: '-' },
        ],
      },
    ],
  },
  {
    performer: 'Tamsin Achebe-Lowry',
    protocol: 'occluded-48h',
    atHours: -3 * 24 - 2,
    location: 'Make-up room 2',
    status: 'applied',
    removedAfterHours: 48,
    items: [
      { lot: 'EL-2603', site: 'Upper back, right 1' },
      { lot: 'SR-2605', site: 'Upper back, right 2' },
    ],
  },
];

export async function seedDemoPatchTests(db: Db, v: { productionId: string; headId: string; leadId: string; performers: ReadonlyMap<string, string>; now: number }): Promise<void> {
  const versions = new Map<string, string>();
  for (const pv of await db.selectFrom('protocol_versions').select(['id', 'protocol_id', 'version']).orderBy('version').execute()) versions.set(pv.protocol_id, pv.id);
  const lots = new Map((await db.selectFrom('product_lots').select(['id', 'code', 'product_id', 'formulation_id']).execute()).map((l) => [l.code, l]));
  await db.transaction().execute(async (trx) => {
    for (const t of DEMO_TESTS) {
      const at = new Date(v.now + t.atHours * HOUR);
      if (t.status === 'booked') at.setUTCMinutes(30, 0, 0);
      const booking = await trx
        .insertInto('bookings')
        .values({ performer_id: v.performers.get(t.performer)!, production_id: v.productionId, purpose: 'patch_test', starts_at: at, location: t.location, status: t.status === 'booked' ? 'booked' : 'done', created_by: v.headId })
        .returning('id')
        .executeTakeFirstOrThrow();
      const applied = t.status !== 'booked';
      await trx
        .insertInto('patch_tests')
        .values({
          booking_id: booking.id,
          performer_id: v.performers.get(t.performer)!,
          production_id: v.productionId,
          protocol_version_id: versions.get(t.protocol)!,
          status: t.status,
          applied_at: applied ? at : null,
          applied_by: applied ? v.leadId : null,
          removed_at: applied && t.removedAfterHours !== undefined ? new Date(at.getTime() + t.removedAfterHours * HOUR) : null,
          closed_at: t.status === 'closed' ? new Date(at.getTime() + 5 * DAY) : null,
          closed_by: t.status === 'closed' ? v.leadId : null,
          created_by: v.headId,
        })
        .execute();
      for (const [i, item] of t.items.entries()) {
        const lot = lots.get(item.lot)!;
        const tp = await trx
          .insertInto('patch_test_products')
          .values({ test_id: booking.id, position: i, product_id: lot.product_id, lot_id: lot.id, formulation_id: lot.formulation_id, site: item.site })
          .returning('id')
          .executeTakeFirstOrThrow();
        for (const r of item.readings ?? []) {
          await trx
            .insertInto('patch_test_readings')
            .values({ test_product_id: tp.id, point_id: r.point, read_at: new Date(at.getTime() + r.afterHours * HOUR), code: sealJson(r.code), note: r.note ? sealJson(r.note) : null, read_by: v.leadId })
            .execute();
        }
      }
    }
  });
}
