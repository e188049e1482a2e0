import { sql } from 'kysely';
import type { IcdrgCode } from '#shared/domain/icdrg.ts';
import type { OverrideState } from '#shared/domain/clearance.ts';
import type { TestStatus } from '#shared/domain/reading-schedule.ts';
import { openJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

/** One tested product of a performer with its readings (codes opened), as clearance reads it. */
export interface TestedProductRow {
  testId: string;
  testProductId: string;
  productId: string;
  formulationId: string;
  lotId: string;
  site: string;
  status: TestStatus;
  appliedAt: Date | null;
  protocolVersionId: string;
  readings: { pointId: string; readAt: Date; code: IcdrgCode }[];
}

/**
 * Every product ever put on this performer's skin in a test, any status, with every reading: one query,
 * a row a tested product with its readings gathered in PostgreSQL (oldest first, times as epoch ms).
 */
export async function listTestedProducts(db: Db, performerId: string): Promise<TestedProductRow[]> {
  const rows = await db
    .selectFrom('patch_test_products as tp')
    .innerJoin('patch_tests as t', 't.booking_id', 'tp.test_id')
    .innerJoin('bookings as b', 'b.id', 't.booking_id')
    .select([
      'tp.id',
      'tp.test_id',
      'tp.product_id',
      'tp.formulation_id',
      'tp.lot_id',
      'tp.site',
      // A booked test whose session was cancelled from the sessions list is cancelled too.
      sql<TestStatus>`case when t.status = 'booked' and b.status = 'cancelled' then 'cancelled' else t.status end`.as('status'),
      't.applied_at',
      't.protocol_version_id',
      sql<[string, number, string][] | null>`(
        select json_agg(json_build_array(r.point_id, extract(epoch from r.read_at) * 1000, r.code) order by r.read_at)
        from patch_test_readings r where r.test_product_id = tp.id
      )`.as('readings'),
    ])
    .where('t.performer_id', '=', performerId)
    // The session is the same performer's: said here so their sessions are found by index, not scanned.
    .where('b.performer_id', '=', performerId)
    .orderBy('t.created_at')
    .orderBy('tp.test_id')
    .orderBy('tp.position')
    .execute();
  return rows.map((r) => ({
    testId: r.test_id,
    testProductId: r.id,
    productId: r.product_id,
    formulationId: r.formulation_id,
    lotId: r.lot_id,
    site: r.site,
    status: r.status,
    appliedAt: r.applied_at ? new Date(r.applied_at) : null,
    protocolVersionId: r.protocol_version_id,
    readings: (r.readings ?? []).map(([pointId, ms, code]) => ({ pointId, readAt: new Date(Math.floor(ms)), code: openJson<IcdrgCode>(code) })),
  }));
}

/** One override of the lead, without its note (the note stays sealed: clearance never reads it). */
export interface OverrideRow {
  id: string;
  formulationId: string;
  productionId: string;
  state: OverrideState;
  by: string;
  at: Date;
  expiresAt: Date | null;
}

/** Every override set for this performer, oldest first (the latest per formulation counts): one query. */
export async function listOverrides(db: Db, performerId: string): Promise<OverrideRow[]> {
  const rows = await db
    .selectFrom('clearance_overrides as o')
    .leftJoin('users as u', 'u.id', 'o.set_by')
    .select(['o.id', 'o.formulation_id', 'o.production_id', 'o.state', 'o.set_at', 'o.expires_at', 'u.display_name'])
    .where('o.performer_id', '=', performerId)
    .orderBy('o.set_at')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    formulationId: r.formulation_id,
    productionId: r.production_id,
    state: r.state,
    by: r.display_name ?? 'a former lead',
    at: new Date(r.set_at),
    expiresAt: r.expires_at ? new Date(r.expires_at) : null,
  }));
}

/** Whether a formulation can be overridden for this performer: some product's current one, or one tested on them. One query. */
export async function formulationKnownFor(db: Db, q: { performerId: string; formulationId: string }): Promise<boolean> {
  const row = await db
    .selectNoFrom((eb) => [
      eb
        .or([
          eb.exists(eb.selectFrom('products').select('id').where('current_formulation_id', '=', q.formulationId)),
          eb.exists(
            eb
              .selectFrom('patch_test_products as tp')
              .innerJoin('patch_tests as t', 't.booking_id', 'tp.test_id')
              .select('tp.id')
              .where('tp.formulation_id', '=', q.formulationId)
              .where('t.performer_id', '=', q.performerId),
          ),
        ])
        .as('known'),
    ])
    .executeTakeFirstOrThrow();
  return row.known === true;
}
