import { sql } from 'kysely';
import type { PieceStatus } from '#shared/domain/builds.ts';
import type { SparesRule } from '#shared/domain/pieces.ts';
import { SparesRuleSchema } from '#shared/schemas/appliance-calc.ts';
import type { Db } from '../../db/index.ts';

/* Pieces of appliance builds, one row each, and the shoot days planned for each appliance. */

export interface PieceRow {
  id: string;
  buildId: string;
  number: number;
  status: PieceStatus;
  applicationId: string | null;
  statusAt: Date | null;
  statusBy: string | null;
  note: string | null;
  version: number;
}

function pieceQuery(db: Db) {
  return db
    .selectFrom('appliance_pieces as ap')
    .leftJoin('users as u', 'u.id', 'ap.status_by')
    .select(['ap.id', 'ap.build_id', 'ap.number', 'ap.status', 'ap.application_id', 'ap.status_at', 'u.display_name', 'ap.note', 'ap.version']);
}
type Selected = Awaited<ReturnType<ReturnType<typeof pieceQuery>['executeTakeFirstOrThrow']>>;

function toPiece(r: Selected): PieceRow {
  return {
    id: r.id,
    buildId: r.build_id,
    number: r.number,
    status: r.status,
    applicationId: r.application_id,
    statusAt: r.status_at ? new Date(r.status_at) : null,
    statusBy: r.display_name,
    note: r.note,
    version: r.version,
  };
}

/** The pieces of many builds, by number, from one query. */
export async function listPieces(db: Db, buildIds: readonly string[]): Promise<Map<string, PieceRow[]>> {
  const out = new Map<string, PieceRow[]>();
  if (buildIds.length === 0) return out;
  const rows = await pieceQuery(db).where('ap.build_id', 'in', [...new Set(buildIds)]).orderBy('ap.build_id').orderBy('ap.number').execute();
  for (const r of rows) {
    const list = out.get(r.build_id) ?? out.set(r.build_id, []).get(r.build_id)!;
    list.push(toPiece(r));
  }
  return out;
}

export async function findPiece(db: Db, id: string): Promise<PieceRow | undefined> {
  const r = await pieceQuery(db).where('ap.id', '=', id).executeTakeFirst();
  return r ? toPiece(r) : undefined;
}

/** Adds pieces numbered on from the build's highest number. */
export async function insertPieces(db: Db, buildId: string, fromNumber: number, count: number): Promise<void> {
  if (count <= 0) return;
  await db
    .insertInto('appliance_pieces')
    .values(Array.from({ length: count }, (_, i) => ({ build_id: buildId, number: fromNumber + i })))
    .execute();
}

export async function deletePieces(db: Db, ids: readonly string[]): Promise<void> {
  if (ids.length === 0) return;
  await db.deleteFrom('appliance_pieces').where('id', 'in', [...ids]).execute();
}

/** Marks a piece if it is still at `version`. */
export async function setPieceStatusAtVersion(
  db: Db,
  id: string,
  v: { status: PieceStatus; applicationId: string | null; note: string | null; by: string },
  version: number,
): Promise<boolean> {
  const res = await db
    .updateTable('appliance_pieces')
    .set({ status: v.status, application_id: v.applicationId, note: v.note, status_by: v.by, status_at: sql`now()`, version: sql`version + 1` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** Builds and pieces per mold of a production: made, used and spoiled across its builds. */
function tallyQuery(db: Db, productionId: string) {
  return db
    .selectFrom('appliance_builds as b')
    .leftJoin('appliance_pieces as ap', 'ap.build_id', 'b.id')
    .select([
      'b.mold_id',
      sql<number>`count(distinct b.id)::int`.as('builds'),
      sql<number>`count(ap.id)::int`.as('made'),
      sql<number>`count(ap.id) filter (where ap.status = 'used')::int`.as('used'),
      sql<number>`count(ap.id) filter (where ap.status = 'spoiled')::int`.as('spoiled'),
    ])
    .where('b.production_id', '=', productionId)
    .groupBy('b.mold_id');
}

export interface MoldTally {
  builds: number;
  made: number;
  used: number;
  spoiled: number;
}

/** Pieces made, used and spoiled per mold on a production, across all its builds, and how many builds. */
export async function tallyByMold(db: Db, productionId: string, moldIds?: readonly string[]): Promise<Map<string, MoldTally>> {
  if (moldIds && moldIds.length === 0) return new Map();
  let q = tallyQuery(db, productionId);
  if (moldIds) q = q.where('b.mold_id', 'in', [...moldIds]);
  const rows = await q.execute();
  return new Map(rows.map((r) => [r.mold_id, { builds: r.builds, made: r.made, used: r.used, spoiled: r.spoiled }]));
}

// ---- shoot plans

export interface PlanRow {
  id: string;
  productionId: string;
  moldId: string;
  shootDaysPlanned: number;
  spares: SparesRule;
  piecesPerDay: number;
  updatedAt: Date;
  updatedBy: string | null;
  version: number;
}

function planQuery(db: Db) {
  return db
    .selectFrom('appliance_plans as pl')
    .leftJoin('users as u', 'u.id', 'pl.updated_by')
    .select(['pl.id', 'pl.production_id', 'pl.mold_id', 'pl.shoot_days_planned', 'pl.spares', 'pl.pieces_per_day', 'pl.updated_at', 'u.display_name', 'pl.version']);
}
type PlanSelected = Awaited<ReturnType<ReturnType<typeof planQuery>['executeTakeFirstOrThrow']>>;

function toPlan(r: PlanSelected): PlanRow {
  return {
    id: r.id,
    productionId: r.production_id,
    moldId: r.mold_id,
    shootDaysPlanned: r.shoot_days_planned,
    spares: SparesRuleSchema.parse(r.spares),
    piecesPerDay: r.pieces_per_day,
    updatedAt: new Date(r.updated_at),
    updatedBy: r.display_name,
    version: r.version,
  };
}

/** The plans of a production, by mold (of these molds only, when named). */
export async function listPlans(db: Db, productionId: string, moldIds?: readonly string[]): Promise<Map<string, PlanRow>> {
  if (moldIds && moldIds.length === 0) return new Map();
  let q = planQuery(db).where('pl.production_id', '=', productionId);
  if (moldIds) q = q.where('pl.mold_id', 'in', [...moldIds]);
  return new Map((await q.execute()).map((r) => [r.mold_id, toPlan(r)]));
}

/** The planned appliances of a production, each with its tally (zeros before any build): one statement. */
export async function listPlansWithTally(db: Db, productionId: string): Promise<Map<string, { plan: PlanRow; tally: MoldTally }>> {
  const rows = await planQuery(db)
    .leftJoin(tallyQuery(db, productionId).as('t'), 't.mold_id', 'pl.mold_id')
    .select([
      sql<number>`coalesce(t.builds, 0)`.as('t_builds'),
      sql<number>`coalesce(t.made, 0)`.as('t_made'),
      sql<number>`coalesce(t.used, 0)`.as('t_used'),
      sql<number>`coalesce(t.spoiled, 0)`.as('t_spoiled'),
    ])
    .where('pl.production_id', '=', productionId)
    .execute();
  return new Map(rows.map((r) => [r.mold_id, { plan: toPlan(r), tally: { builds: r.t_builds, made: r.t_made, used: r.t_used, spoiled: r.t_spoiled } }]));
}

/** Locks one appliance's plan for a change to it. */
export async function lockPlan(db: Db, productionId: string, moldId: string): Promise<PlanRow | undefined> {
  const r = await planQuery(db).where('pl.production_id', '=', productionId).where('pl.mold_id', '=', moldId).forUpdate('pl').executeTakeFirst();
  return r ? toPlan(r) : undefined;
}

export interface PlanValues {
  shootDaysPlanned: number;
  spares: SparesRule;
  piecesPerDay: number;
  updatedBy: string;
}

export async function insertPlan(db: Db, productionId: string, moldId: string, v: PlanValues): Promise<void> {
  await db
    .insertInto('appliance_plans')
    .values({ production_id: productionId, mold_id: moldId, shoot_days_planned: v.shootDaysPlanned, spares: JSON.stringify(v.spares), pieces_per_day: v.piecesPerDay, updated_by: v.updatedBy })
    .execute();
}

export async function updatePlanAtVersion(db: Db, id: string, v: PlanValues, version: number): Promise<boolean> {
  const res = await db
    .updateTable('appliance_plans')
    .set({ shoot_days_planned: v.shootDaysPlanned, spares: JSON.stringify(v.spares), pieces_per_day: v.piecesPerDay, updated_by: v.updatedBy, updated_at: sql`now()`, version: sql`version + 1` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/**
 * Marks pieces worn for a logged application: a piece on the shelf, or used with no application named
 * yet, becomes used for it. Answers the ids it could not take (spoiled, or worn for another application).
 */
export async function markPiecesWornFor(db: Db, pieceIds: readonly string[], applicationId: string, by: string): Promise<string[]> {
  if (pieceIds.length === 0) return [];
  const done = await db
    .updateTable('appliance_pieces')
    .set({ status: 'used', application_id: applicationId, status_by: by, status_at: sql`now()`, version: sql`version + 1` })
    .where('id', 'in', [...pieceIds])
    .where((eb) => eb.or([eb('status', '=', 'on_hand'), eb.and([eb('status', '=', 'used'), eb('application_id', 'is', null)])]))
    .returning('id')
    .execute();
  const ok = new Set(done.map((r) => r.id));
  return pieceIds.filter((id) => !ok.has(id));
}

/** The pieces worn for these applications: number and build. */
export async function listPiecesWornFor(db: Db, applicationIds: readonly string[]): Promise<Map<string, { id: string; number: number; buildId: string }[]>> {
  const out = new Map<string, { id: string; number: number; buildId: string }[]>();
  if (applicationIds.length === 0) return out;
  const rows = await db.selectFrom('appliance_pieces').select(['id', 'number', 'build_id', 'application_id']).where('application_id', 'in', [...applicationIds]).orderBy('number').execute();
  for (const r of rows) {
    const list = out.get(r.application_id!) ?? out.set(r.application_id!, []).get(r.application_id!)!;
    list.push({ id: r.id, number: r.number, buildId: r.build_id });
  }
  return out;
}

/** Pieces on the shelf made from a performer's molds for a production, for the artist's check to add. */
export async function listPiecesOnHandFor(db: Db, productionId: string, performerId: string): Promise<{ id: string; number: number; buildId: string; madeOn: string; moldLabel: string }[]> {
  const rows = await db
    .selectFrom('appliance_pieces as ap')
    .innerJoin('appliance_builds as b', 'b.id', 'ap.build_id')
    .innerJoin('casts as c', 'c.id', 'b.mold_id')
    .select(['ap.id', 'ap.number', 'b.id as build_id', sql<string>`b.made_on::text`.as('made_on'), 'c.label_code', 'c.region'])
    .where('b.production_id', '=', productionId)
    .where('b.performer_id', '=', performerId)
    .where('ap.status', '=', 'on_hand')
    .orderBy('b.made_on', 'desc')
    .orderBy('ap.number')
    .limit(100)
    .execute();
  return rows.map((r) => ({ id: r.id, number: r.number, buildId: r.build_id, madeOn: r.made_on, moldLabel: `${r.region} mold ${r.label_code}` }));
}
