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

interface ReadingJson {
  point_id: string;
  read_at: string;
  code: string;
}

/** Every product ever put on this performer's skin in a test, any status, with every reading: one query. */
export async function listTestedProducts(db: Db, performerId: string): Promise<TestedProductRow[]> {
  const rows = await db
    .selectFrom('patch_test_products as tp')
    .innerJoin('patch_tests as t', 't.booking_id', 'tp.test_id')
    .select([
      'tp.id',
      'tp.test_id',
      'tp.product_id',
      'tp.formulation_id',
      'tp.lot_id',
      'tp.site',
      't.status',
      't.applied_at',
      't.protocol_version_id',
      sql<ReadingJson[]>`coalesce((select json_agg(json_build_object('point_id', r.point_id, 'read_at', r.read_at, 'code', r.code) order by r.read_at)
        from patch_test_readings r where r.test_product_id = tp.id), '[]'::json)`.as('readings'),
    ])
    .where('t.performer_id', '=', performerId)
    .orderBy('t.created_at')
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
    readings: r.readings.map((x) => ({ pointId: x.point_id, readAt: new Date(x.read_at), code: openJson<IcdrgCode>(x.code) })),
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
