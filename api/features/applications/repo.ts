import { sql } from 'kysely';
import { z } from 'zod';
import type { SkinCheckOutcome } from '#shared/domain/applications.ts';
import { CheckItemViewSchema } from '#shared/schemas/checks.ts';
import { openJson, sealJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

const SnapshotSchema = z.object({ id: z.string(), runAt: z.string(), verdict: z.enum(['go', 'stop']), message: z.string(), items: z.array(CheckItemViewSchema) });
export type CheckSnapshot = z.infer<typeof SnapshotSchema>;

export interface ProductLotRow {
  productId: string;
  productName: string;
  lotId: string;
  lotCode: string;
  formulationId: string;
}

export interface SkinCheckRow {
  outcome: SkinCheckOutcome;
  /** Opened here, in the repo: a health detail. */
  observation: string | null;
  checkedAt: Date;
  checkedByName: string | null;
}

export interface ApplicationRow {
  id: string;
  productionId: string;
  performerId: string;
  performerName: string;
  artistName: string | null;
  appliedOn: string;
  description: string | null;
  startedAt: Date;
  endedAt: Date | null;
  notes: string | null;
  check: CheckSnapshot;
  skinCheck: SkinCheckRow | null;
  version: number;
}

function applicationQuery(db: Db) {
  return db
    .selectFrom('applications as a')
    .innerJoin('performers as p', 'p.id', 'a.performer_id')
    .leftJoin('users as u', 'u.id', 'a.artist_id')
    .leftJoin('skin_checks as s', 's.application_id', 'a.id')
    .leftJoin('users as su', 'su.id', 's.checked_by')
    .select([
      'a.id',
      'a.production_id',
      'a.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'u.display_name as artist_name',
      sql<string>`a.applied_on::text`.as('applied_on'),
      'a.description',
      'a.started_at',
      'a.ended_at',
      'a.notes',
      'a.check_snapshot',
      'a.version',
      's.outcome',
      's.observation',
      's.checked_at',
      'su.display_name as checked_by_name',
    ]);
}
type Selected = Awaited<ReturnType<ReturnType<typeof applicationQuery>['executeTakeFirstOrThrow']>>;

function toApplication(r: Selected): ApplicationRow {
  return {
    id: r.id,
    productionId: r.production_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    artistName: r.artist_name ?? null,
    appliedOn: r.applied_on,
    description: r.description,
    startedAt: new Date(r.started_at),
    endedAt: r.ended_at ? new Date(r.ended_at) : null,
    notes: r.notes,
    check: SnapshotSchema.parse(r.check_snapshot),
    skinCheck: r.outcome ? { outcome: openJson<SkinCheckOutcome>(r.outcome), observation: r.observation ? openJson<string>(r.observation) : null, checkedAt: new Date(r.checked_at!), checkedByName: r.checked_by_name ?? null } : null,
    version: r.version,
  };
}

export async function findApplication(db: Db, id: string): Promise<ApplicationRow | undefined> {
  const r = await applicationQuery(db).where('a.id', '=', id).executeTakeFirst();
  return r ? toApplication(r) : undefined;
}

export async function listApplicationRows(db: Db, where: { productionIds: readonly string[]; day?: string; performerId?: string; ids?: readonly string[] }): Promise<ApplicationRow[]> {
  if (where.productionIds.length === 0) return [];
  let q = applicationQuery(db).where('a.production_id', 'in', [...where.productionIds]);
  if (where.day) q = q.where('a.applied_on', '=', where.day);
  if (where.performerId) q = q.where('a.performer_id', '=', where.performerId);
  if (where.ids) {
    if (where.ids.length === 0) return [];
    q = q.where('a.id', 'in', [...where.ids]);
  }
  const rows = await q.orderBy('a.started_at', 'desc').orderBy('a.id').limit(300).execute();
  return rows.map(toApplication);
}

/** Products (applied, then removal) of many applications with lot codes, from one query. */
export async function listApplicationProducts(db: Db, applicationIds: readonly string[]): Promise<Map<string, { applied: ProductLotRow[]; removal: ProductLotRow[] }>> {
  const out = new Map<string, { applied: ProductLotRow[]; removal: ProductLotRow[] }>();
  if (applicationIds.length === 0) return out;
  const rows = await db
    .selectFrom('application_products as ap')
    .innerJoin('products as p', 'p.id', 'ap.product_id')
    .innerJoin('product_lots as l', 'l.id', 'ap.lot_id')
    .select(['ap.application_id', 'ap.use', 'ap.product_id', 'p.name', 'ap.lot_id', 'l.code', 'ap.formulation_id'])
    .where('ap.application_id', 'in', [...new Set(applicationIds)])
    .orderBy('ap.application_id')
    .orderBy('ap.use')
    .orderBy('ap.position')
    .execute();
  for (const r of rows) {
    const entry = out.get(r.application_id) ?? out.set(r.application_id, { applied: [], removal: [] }).get(r.application_id)!;
    entry[r.use].push({ productId: r.product_id, productName: r.name, lotId: r.lot_id, lotCode: r.code, formulationId: r.formulation_id });
  }
  return out;
}

export async function insertApplication(
  db: Db,
  v: { productionId: string; performerId: string; checkId: string; artistId: string; appliedOn: string; description: string | null; startedAt: Date; endedAt: Date | null; notes: string | null; snapshot: CheckSnapshot },
): Promise<string> {
  const r = await db
    .insertInto('applications')
    .values({
      production_id: v.productionId,
      performer_id: v.performerId,
      check_id: v.checkId,
      artist_id: v.artistId,
      applied_on: v.appliedOn,
      description: v.description,
      started_at: v.startedAt,
      ended_at: v.endedAt,
      notes: v.notes,
      check_snapshot: JSON.stringify(v.snapshot),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function insertApplicationProducts(db: Db, applicationId: string, use: 'applied' | 'removal', rows: readonly { productId: string; lotId: string; formulationId: string }[], from = 0): Promise<void> {
  if (rows.length === 0) return;
  await db
    .insertInto('application_products')
    .values(rows.map((r, i) => ({ application_id: applicationId, use, position: from + i, product_id: r.productId, lot_id: r.lotId, formulation_id: r.formulationId })))
    .execute();
}

export async function countRemovalProducts(db: Db, applicationId: string): Promise<number> {
  const r = await db.selectFrom('application_products').select((eb) => eb.fn.countAll<string>().as('n')).where('application_id', '=', applicationId).where('use', '=', 'removal').executeTakeFirstOrThrow();
  return Number(r.n);
}

/** Whether an application was already logged from this check. */
export async function applicationOfCheck(db: Db, checkId: string): Promise<string | undefined> {
  return (await db.selectFrom('applications').select('id').where('check_id', '=', checkId).executeTakeFirst())?.id;
}

export async function lockApplication(db: Db, id: string): Promise<{ productionId: string; performerId: string; startedAt: Date; endedAt: Date | null; version: number; skinChecked: boolean } | undefined> {
  const r = await db
    .selectFrom('applications as a')
    .select(['a.production_id', 'a.performer_id', 'a.started_at', 'a.ended_at', 'a.version', sql<boolean>`exists (select 1 from skin_checks s where s.application_id = a.id)`.as('skin_checked')])
    .where('a.id', '=', id)
    .forUpdate('a')
    .executeTakeFirst();
  return r ? { productionId: r.production_id, performerId: r.performer_id, startedAt: new Date(r.started_at), endedAt: r.ended_at ? new Date(r.ended_at) : null, version: r.version, skinChecked: r.skin_checked } : undefined;
}

export async function setEndedAtVersion(db: Db, id: string, endedAt: Date, version: number): Promise<boolean> {
  const r = await db
    .updateTable('applications')
    .set((eb) => ({ ended_at: endedAt, version: eb('version', '+', 1) }))
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

export async function insertSkinCheck(db: Db, v: { applicationId: string; outcome: SkinCheckOutcome; observation: string | null; userId: string }): Promise<void> {
  await db
    .insertInto('skin_checks')
    .values({ application_id: v.applicationId, outcome: sealJson(v.outcome), observation: v.observation === null ? null : sealJson(v.observation), checked_by: v.userId })
    .execute();
}
