import { sql } from 'kysely';
import type { IcdrgCode } from '#shared/domain/icdrg.ts';
import type { Protocol } from '#shared/domain/protocols.ts';
import type { TestStatus } from '#shared/domain/reading-schedule.ts';
import { openJson, sealJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';
import { protocolOfRow } from '../protocols/index.ts';
import { bringsGateConsents, type GateConsentJson, gateConsentsJsonSql } from '../consents/index.ts';

/** A booked test whose session was cancelled (from the sessions list) is cancelled too. */
const STATUS = sql<TestStatus>`case when t.status = 'booked' and b.status = 'cancelled' then 'cancelled' else t.status end`;

/** The stored statuses a test can have to be shown with one of these. */
export function storedStatuses(shown: readonly TestStatus[]): TestStatus[] {
  return [...new Set<TestStatus>(shown.includes('cancelled') ? [...shown, 'booked'] : shown)];
}

/** A test with its session's time and place (a patch test is a booking of that purpose). */
export interface TestRow {
  id: string;
  performerId: string;
  performerName: string;
  productionId: string;
  protocolVersionId: string;
  /** The protocol version it was booked on (published versions never change). */
  protocol: Protocol;
  status: TestStatus;
  startsAt: Date;
  location: string | null;
  appliedAt: Date | null;
  removedAt: Date | null;
  closedAt: Date | null;
  productCount: number;
  /** Empty when the list asked for counts only. */
  sites: string[];
  /** Empty when the list asked for counts only. */
  takenPointIds: string[];
  /** The consents that can cover it, for the session gate; null unless a list across performers asked for counts only. */
  gateConsents: GateConsentJson[] | null;
  version: number;
}

export interface TestFilter {
  ids?: readonly string[];
  productionId?: string;
  productionIds?: readonly string[];
  performerId?: string;
  statuses?: readonly TestStatus[];
  startsFrom?: Date;
  startsBefore?: Date;
  /** Lists that show only how many products leave out the sites and which points were read at each. */
  countsOnly?: boolean;
}

/** A page of a list: newest first, or in start order (the default), and how many to skip and take. */
export interface TestPage {
  newestFirst?: boolean;
  offset: number;
  limit: number;
}

/**
 * Tests in start order (at most 500 unless a page says otherwise), each with its protocol, product count,
 * sites and the points read at every site (or, for counts only across performers, the consents the gate
 * reads): one query.
 */
export async function listTestRows(db: Db, where: TestFilter, page: TestPage = { offset: 0, limit: 500 }): Promise<TestRow[]> {
  let q = db
    .selectFrom('patch_tests as t')
    .innerJoin('bookings as b', 'b.id', 't.booking_id')
    .innerJoin('performers as p', 'p.id', 't.performer_id')
    .innerJoin('protocol_versions as v', 'v.id', 't.protocol_version_id')
    .select([
      't.booking_id',
      't.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      't.production_id',
      't.protocol_version_id',
      'v.protocol_id',
      'v.name',
      'v.kind',
      'v.description',
      'v.occlusion_minutes',
      'v.applications',
      'v.readings',
      STATUS.as('status'),
      'b.starts_at',
      'b.location',
      't.applied_at',
      't.removed_at',
      't.closed_at',
      't.version',
      sql<number>`(select count(*)::int from patch_test_products tp where tp.test_id = t.booking_id)`.as('product_count'),
      // The sites in order, and the points read at every site, unless the list wants counts only.
      (where.countsOnly ? sql<string[]>`'{}'::text[]` : sql<string[]>`array(select tp.site from patch_test_products tp where tp.test_id = t.booking_id order by tp.position)`).as('sites'),
      (where.countsOnly
        ? sql<string[]>`'{}'::text[]`
        : sql<string[]>`array(
            select r.point_id from patch_test_readings r join patch_test_products tp on tp.id = r.test_product_id
            where tp.test_id = t.booking_id group by r.point_id
            having count(*) >= (select count(*) from patch_test_products tp2 where tp2.test_id = t.booking_id)
            order by r.point_id)`
      ).as('taken'),
      // Counts-only lists say whether each test waits for a consent: its consents come along where the
      // list brings them (`bringsGateConsents`).
      (where.countsOnly && bringsGateConsents(where) ? gateConsentsJsonSql(sql.ref('t.performer_id'), sql.ref('t.production_id')) : sql<GateConsentJson[] | null>`null`).as('gate_consents'),
    ]);
  if (where.ids) {
    if (where.ids.length === 0) return [];
    q = q.where('t.booking_id', 'in', [...where.ids]);
  }
  if (where.productionId) q = q.where('t.production_id', '=', where.productionId);
  if (where.productionIds) {
    if (where.productionIds.length === 0) return [];
    q = q.where('t.production_id', 'in', [...where.productionIds]);
  }
  if (where.performerId) q = q.where('t.performer_id', '=', where.performerId);
  if (where.statuses) {
    if (where.statuses.length === 0) return [];
    // The stored status narrows first, so the (production, status) index serves the lists;
    // a test shown as cancelled may still be stored as booked.
    q = q.where('t.status', 'in', storedStatuses(where.statuses)).where(STATUS, 'in', [...where.statuses]);
  }
  if (where.startsFrom) q = q.where('b.starts_at', '>=', where.startsFrom);
  if (where.startsBefore) q = q.where('b.starts_at', '<', where.startsBefore);
  const dir = page.newestFirst ? 'desc' : 'asc';
  const rows = await q.orderBy('b.starts_at', dir).orderBy('t.booking_id', dir).offset(page.offset).limit(page.limit).execute();
  return rows.map((r) => ({
    id: r.booking_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    protocolVersionId: r.protocol_version_id,
    protocol: protocolOfRow(r),
    status: r.status,
    startsAt: new Date(r.starts_at),
    location: r.location,
    appliedAt: r.applied_at ? new Date(r.applied_at) : null,
    removedAt: r.removed_at ? new Date(r.removed_at) : null,
    closedAt: r.closed_at ? new Date(r.closed_at) : null,
    productCount: r.product_count,
    sites: r.sites,
    takenPointIds: r.taken,
    gateConsents: r.gate_consents,
    version: r.version,
  }));
}

/** How many tests one performer has in these productions (a page's total). */
export async function countPerformerTests(db: Db, where: { performerId: string; productionIds: readonly string[] }): Promise<number> {
  if (where.productionIds.length === 0) return 0;
  const row = await db
    .selectFrom('patch_tests')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('performer_id', '=', where.performerId)
    .where('production_id', 'in', [...where.productionIds])
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function findTestRow(db: Db, id: string): Promise<TestRow | undefined> {
  return (await listTestRows(db, { ids: [id] }))[0];
}

/** Locks a test for a change; its version decides a stale edit. */
export async function lockTest(db: Db, id: string): Promise<{ status: TestStatus; version: number; appliedAt: Date | null; removedAt: Date | null } | undefined> {
  const r = await db
    .selectFrom('patch_tests as t')
    .innerJoin('bookings as b', 'b.id', 't.booking_id')
    .select([STATUS.as('status'), 't.version', 't.applied_at', 't.removed_at'])
    .where('t.booking_id', '=', id)
    .forUpdate()
    .executeTakeFirst();
  return r ? { status: r.status, version: r.version, appliedAt: r.applied_at ? new Date(r.applied_at) : null, removedAt: r.removed_at ? new Date(r.removed_at) : null } : undefined;
}

export async function insertTest(db: Db, v: { bookingId: string; performerId: string; productionId: string; protocolVersionId: string; createdBy: string }): Promise<void> {
  await db.insertInto('patch_tests').values({ booking_id: v.bookingId, performer_id: v.performerId, production_id: v.productionId, protocol_version_id: v.protocolVersionId, created_by: v.createdBy }).execute();
}

export async function insertTestedProducts(db: Db, testId: string, items: readonly { productId: string; lotId: string; formulationId: string; site: string }[]): Promise<void> {
  await db
    .insertInto('patch_test_products')
    .values(items.map((p, i) => ({ test_id: testId, position: i, product_id: p.productId, lot_id: p.lotId, formulation_id: p.formulationId, site: p.site })))
    .execute();
}

type TestChange = Partial<{ status: TestStatus; applied_at: Date; applied_by: string; removed_at: Date; closed_at: Date; closed_by: string; cancelled_at: Date }>;

/** Changes a test and bumps its version. */
export async function updateTest(db: Db, id: string, change: TestChange): Promise<void> {
  await db
    .updateTable('patch_tests')
    .set({ ...change, updated_at: new Date(), version: sql`version + 1` })
    .where('booking_id', '=', id)
    .execute();
}

/** Marks a change of the session (time or place) on the test's version too, so a stale screen gets 409. */
export async function bumpTestVersion(db: Db, id: string): Promise<void> {
  await updateTest(db, id, {});
}

/** The products on one test, in position order, with names and lot codes. */
export async function listTestProducts(db: Db, testId: string): Promise<{ id: string; productId: string; productName: string; lotId: string; lotCode: string; formulationId: string; site: string }[]> {
  const rows = await db
    .selectFrom('patch_test_products as tp')
    .innerJoin('products as p', 'p.id', 'tp.product_id')
    .innerJoin('product_lots as l', 'l.id', 'tp.lot_id')
    .select(['tp.id', 'tp.product_id', 'p.name', 'tp.lot_id', 'l.code', 'tp.formulation_id', 'tp.site'])
    .where('tp.test_id', '=', testId)
    .orderBy('tp.position')
    .execute();
  return rows.map((r) => ({ id: r.id, productId: r.product_id, productName: r.name, lotId: r.lot_id, lotCode: r.code, formulationId: r.formulation_id, site: r.site }));
}

export interface ReadingRow {
  id: string;
  testProductId: string;
  pointId: string;
  readAt: Date;
  late: boolean;
  code: IcdrgCode;
  note: string | null;
  readBy: string | null;
  photos: { id: string; width: number; height: number }[];
}

/** Every reading of a test with its photos, codes and notes opened: health details, for the lead and the performer only. */
export async function listTestReadings(db: Db, testId: string): Promise<ReadingRow[]> {
  const rows = await db
    .selectFrom('patch_test_readings as r')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .leftJoin('users as u', 'u.id', 'r.read_by')
    .select([
      'r.id',
      'r.test_product_id',
      'r.point_id',
      'r.read_at',
      'r.late',
      'r.code',
      'r.note',
      'u.display_name',
      sql<{ id: string; width: number; height: number }[]>`coalesce((select json_agg(json_build_object('id', ph.id, 'width', ph.width, 'height', ph.height) order by ph.created_at) from patch_test_photos ph where ph.reading_id = r.id), '[]'::json)`.as('photos'),
    ])
    .where('tp.test_id', '=', testId)
    .orderBy('r.read_at')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    testProductId: r.test_product_id,
    pointId: r.point_id,
    readAt: new Date(r.read_at),
    late: r.late,
    code: openJson<IcdrgCode>(r.code),
    note: r.note === null ? null : openJson<string>(r.note),
    readBy: r.display_name,
    photos: r.photos,
  }));
}

/** Which of a test's sites already have a reading at this point (locked with the test, so a race ends on the unique key). */
export async function readSitesAtPoint(db: Db, testId: string, pointId: string): Promise<Set<string>> {
  const rows = await db
    .selectFrom('patch_test_readings as r')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .select('r.test_product_id')
    .where('tp.test_id', '=', testId)
    .where('r.point_id', '=', pointId)
    .execute();
  return new Set(rows.map((r) => r.test_product_id));
}

export async function insertReadings(db: Db, rows: readonly { testProductId: string; pointId: string; readAt: Date; code: IcdrgCode; note: string | null; late: boolean; readBy: string }[]): Promise<string[]> {
  const out = await db
    .insertInto('patch_test_readings')
    .values(rows.map((r) => ({ test_product_id: r.testProductId, point_id: r.pointId, read_at: r.readAt, code: sealJson(r.code), note: r.note ? sealJson(r.note) : null, late: r.late, read_by: r.readBy })))
    .returning('id')
    .execute();
  return out.map((r) => r.id);
}

/** The reading a photo is added to, with its test. */
export async function findReading(db: Db, readingId: string): Promise<{ id: string; testId: string } | undefined> {
  const r = await db.selectFrom('patch_test_readings as r').innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id').select(['r.id', 'tp.test_id']).where('r.id', '=', readingId).executeTakeFirst();
  return r ? { id: r.id, testId: r.test_id } : undefined;
}

export async function insertPhoto(db: Db, v: { readingId: string; fileId: string; thumbFileId: string; width: number; height: number; createdBy: string }): Promise<string> {
  const r = await db
    .insertInto('patch_test_photos')
    .values({ reading_id: v.readingId, file_id: v.fileId, thumb_file_id: v.thumbFileId, width: v.width, height: v.height, created_by: v.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** A photo of a test's reading, by the test it must belong to. */
export async function findPhoto(db: Db, testId: string, photoId: string): Promise<{ fileId: string; thumbFileId: string } | undefined> {
  const r = await db
    .selectFrom('patch_test_photos as ph')
    .innerJoin('patch_test_readings as r', 'r.id', 'ph.reading_id')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .select(['ph.file_id', 'ph.thumb_file_id'])
    .where('ph.id', '=', photoId)
    .where('tp.test_id', '=', testId)
    .executeTakeFirst();
  return r ? { fileId: r.file_id, thumbFileId: r.thumb_file_id } : undefined;
}

export async function insertOverride(db: Db, v: { performerId: string; productionId: string; formulationId: string; state: string; note: string; expiresAt: Date | null; setBy: string }): Promise<string> {
  const r = await db
    .insertInto('clearance_overrides')
    .values({ performer_id: v.performerId, production_id: v.productionId, formulation_id: v.formulationId, state: v.state as 'cleared', note: sealJson(v.note), expires_at: v.expiresAt, set_by: v.setBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** The latest override note per formulation for this performer: health details, for the lead and the performer. */
export async function listOverrideNotes(db: Db, performerId: string): Promise<Map<string, string>> {
  const rows = await db.selectFrom('clearance_overrides').select(['formulation_id', 'note']).where('performer_id', '=', performerId).orderBy('set_at').execute();
  return new Map(rows.map((r) => [r.formulation_id, openJson<string>(r.note)]));
}

/** Which points were read at which site of a test (no codes): what staff without medical access see. */
export async function listReadPoints(db: Db, testId: string): Promise<{ testProductId: string; pointId: string }[]> {
  const rows = await db
    .selectFrom('patch_test_readings as r')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .select(['r.test_product_id', 'r.point_id'])
    .where('tp.test_id', '=', testId)
    .orderBy('r.read_at')
    .execute();
  return rows.map((r) => ({ testProductId: r.test_product_id, pointId: r.point_id }));
}
