import { sessionsMissingConsent } from '#shared/domain/bookings.ts';
import { readingSchedule } from '#shared/domain/reading-schedule.ts';
import { productOutcome } from '#shared/domain/test-outcome.ts';
import type { PatchTestDetail, PatchTestSummary } from '#shared/schemas/patch-test-log.ts';
import type { Db } from '../../db/index.ts';
import { gateConsentsOfRows } from '../consents/index.ts';
import { listReadPoints, listTestProducts, listTestReadings, listTestRows, type TestFilter, type TestPage, type TestRow } from './repo.ts';

/** Tests as lists show them, each with whether it waits for a consent: one query across performers (tests with their protocols and consents), two for one performer's. */
export async function listTestSummaries(db: Db, where: TestFilter, page?: TestPage): Promise<PatchTestSummary[]> {
  // A summary shows how many products, not where they went or which points were read.
  const rows = await listTestRows(db, { ...where, countsOnly: true }, page);
  return summariesOf(db, rows);
}

async function summariesOf(db: Db, rows: readonly TestRow[]): Promise<PatchTestSummary[]> {
  if (rows.length === 0) return [];
  const consents = await gateConsentsOfRows(db, rows);
  const missing = sessionsMissingConsent(
    rows.map((r) => ({ id: r.id, performerId: r.performerId, productionId: r.productionId, purpose: 'patch_test' as const, startsAt: r.startsAt, status: r.status })),
    consents,
  );
  return rows.map((r) => summaryOf(r, missing.has(r.id)));
}

function summaryOf(r: TestRow, consentMissing: boolean): PatchTestSummary {
  return {
    id: r.id,
    performerId: r.performerId,
    performerName: r.performerName,
    productionId: r.productionId,
    protocolName: r.protocol.name,
    testKind: r.protocol.kind,
    status: r.status,
    startsAt: r.startsAt.toISOString(),
    location: r.location,
    appliedAt: r.appliedAt?.toISOString() ?? null,
    removedAt: r.removedAt?.toISOString() ?? null,
    closedAt: r.closedAt?.toISOString() ?? null,
    consentMissing,
    productCount: r.productCount,
    version: r.version,
  };
}

/**
 * One test as a screen shows it. Health details (codes, notes, photos, outcomes) are read and included
 * only when `medical` is true; otherwise each site says only which readings were taken.
 */
export async function testDetail(db: Db, row: TestRow, opts: { medical: boolean; now: Date; timeZone: string }): Promise<PatchTestDetail> {
  const [[summary], products, readings] = await Promise.all([
    summariesOf(db, [row]),
    listTestProducts(db, row.id),
    // The medical flag decides whether the sealed readings are opened at all.
    opts.medical ? listTestReadings(db, row.id) : Promise.resolve(null),
  ]);
  const start = row.appliedAt ?? row.startsAt;
  const schedule = readingSchedule(row.protocol, { appliedAt: start, removedAt: row.removedAt, now: opts.now, timeZone: opts.timeZone }).map((s) => ({
    ...s,
    dueAt: s.dueAt.toISOString(),
    opensAt: s.opensAt.toISOString(),
    closesAt: s.closesAt.toISOString(),
    status: row.takenPointIds.includes(s.pointId) ? ('done' as const) : s.status,
  }));
  const readPoints = await readPointsBySite(db, row.id, readings);
  return {
    ...summary!,
    protocolVersionId: row.protocolVersionId,
    schedule,
    medical: opts.medical,
    products: products.map((p) => {
      const mine = readings?.filter((r) => r.testProductId === p.id) ?? [];
      const base = { ...p, readPointIds: readPoints.get(p.id) ?? [] };
      if (!readings) return base;
      const o = productOutcome(mine);
      return {
        ...base,
        readings: mine.map((r) => ({ id: r.id, pointId: r.pointId, readAt: r.readAt.toISOString(), late: r.late, code: r.code, note: r.note, readBy: r.readBy, photos: r.photos })),
        outcome: { strongest: o.strongest, final: o.final, pattern: o.pattern },
      };
    }),
  };
}

async function readPointsBySite(db: Db, testId: string, readings: Awaited<ReturnType<typeof listTestReadings>> | null): Promise<Map<string, string[]>> {
  const out = new Map<string, string[]>();
  const list = readings ?? (await listReadPoints(db, testId));
  for (const r of list) (out.get(r.testProductId) ?? out.set(r.testProductId, []).get(r.testProductId)!).push(r.pointId);
  return out;
}

