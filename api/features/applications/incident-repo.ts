import { sql } from 'kysely';
import type { SkinCheckOutcome } from '#shared/domain/applications.ts';
import { openJson, sealJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

export interface IncidentRow {
  id: string;
  applicationId: string;
  productionId: string;
  performerId: string;
  performerName: string;
  reportedAt: Date;
  reportedByName: string | null;
  status: 'open' | 'closed';
  outcome: SkinCheckOutcome;
  /** Opened here: health details. */
  observation: string | null;
  closedAt: Date | null;
  closingNote: string | null;
  version: number;
}

function incidentQuery(db: Db) {
  return db
    .selectFrom('incidents as i')
    .innerJoin('performers as p', 'p.id', 'i.performer_id')
    .innerJoin('skin_checks as s', 's.application_id', 'i.application_id')
    .leftJoin('users as u', 'u.id', 'i.reported_by')
    .select([
      'i.id',
      'i.application_id',
      'i.production_id',
      'i.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'i.reported_at',
      'u.display_name',
      'i.status',
      's.outcome',
      's.observation',
      'i.closed_at',
      'i.closing_note',
      'i.version',
    ]);
}
type Selected = Awaited<ReturnType<ReturnType<typeof incidentQuery>['executeTakeFirstOrThrow']>>;

function toIncident(r: Selected): IncidentRow {
  return {
    id: r.id,
    applicationId: r.application_id,
    productionId: r.production_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    reportedAt: new Date(r.reported_at),
    reportedByName: r.display_name ?? null,
    status: r.status,
    outcome: openJson<SkinCheckOutcome>(r.outcome),
    observation: r.observation ? openJson<string>(r.observation) : null,
    closedAt: r.closed_at ? new Date(r.closed_at) : null,
    closingNote: r.closing_note ? openJson<string>(r.closing_note) : null,
    version: r.version,
  };
}

export async function insertIncident(db: Db, v: { applicationId: string; productionId: string; performerId: string; userId: string }): Promise<string> {
  const r = await db
    .insertInto('incidents')
    .values({ application_id: v.applicationId, production_id: v.productionId, performer_id: v.performerId, reported_by: v.userId })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function findIncident(db: Db, id: string): Promise<IncidentRow | undefined> {
  const r = await incidentQuery(db).where('i.id', '=', id).executeTakeFirst();
  return r ? toIncident(r) : undefined;
}

export async function listIncidents(db: Db, where: { productionIds: readonly string[]; status?: 'open' | 'closed' }): Promise<IncidentRow[]> {
  if (where.productionIds.length === 0) return [];
  let q = incidentQuery(db).where('i.production_id', 'in', [...where.productionIds]);
  if (where.status) q = q.where('i.status', '=', where.status);
  return (await q.orderBy('i.reported_at', 'desc').limit(200).execute()).map(toIncident);
}

export async function closeIncidentAtVersion(db: Db, id: string, v: { note: string; userId: string; version: number }): Promise<boolean> {
  const r = await db
    .updateTable('incidents')
    .set((eb) => ({ status: 'closed', closing_note: sealJson(v.note), closed_by: v.userId, closed_at: new Date(), version: eb('version', '+', 1) }))
    .where('id', '=', id)
    .where('version', '=', v.version)
    .where('status', '=', 'open')
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

export async function countOpenIncidents(db: Db, productionIds: readonly string[]): Promise<number> {
  if (productionIds.length === 0) return 0;
  const r = await db.selectFrom('incidents').select((eb) => eb.fn.countAll<string>().as('n')).where('production_id', 'in', [...productionIds]).where('status', '=', 'open').executeTakeFirstOrThrow();
  return Number(r.n);
}
