import { sql } from 'kysely';
import { openJson, sealJson } from '../../crypto/medical.ts';
import { CheckItemSchema, type CheckItem, type LeadRequestStatus } from '#shared/schemas/checks.ts';
import type { Db } from '../../db/index.ts';
import { z } from 'zod';

const ItemsSchema = z.array(CheckItemSchema);

/** The performer being checked, with whether they are engaged on the production: one query. */
export async function findPerformerForCheck(db: Db, performerId: string, productionId: string): Promise<{ name: string; engaged: boolean } | undefined> {
  const r = await db
    .selectFrom('performers as p')
    .select([
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('name'),
      sql<boolean>`exists (select 1 from engagements e where e.performer_id = p.id and e.production_id = ${productionId})`.as('engaged'),
    ])
    .where('p.id', '=', performerId)
    .executeTakeFirst();
  return r ? { name: r.name, engaged: r.engaged } : undefined;
}

/** A kit's production and products in order, or undefined. */
export async function findKitProducts(db: Db, kitId: string): Promise<{ productionId: string; productIds: string[] } | undefined> {
  const rows = await db
    .selectFrom('kits as k')
    .leftJoin('kit_products as kp', 'kp.kit_id', 'k.id')
    .select(['k.production_id', 'kp.product_id'])
    .where('k.id', '=', kitId)
    .orderBy('kp.position')
    .execute();
  if (rows.length === 0) return undefined;
  return { productionId: rows[0]!.production_id, productIds: rows.flatMap((r) => (r.product_id ? [r.product_id] : [])) };
}

export interface CheckRow {
  id: string;
  productionId: string;
  performerId: string;
  performerName: string;
  kitId: string | null;
  runAt: Date;
  runByName: string | null;
  items: CheckItem[];
  pieceIds: string[];
  applicationId: string | null;
}

export async function findCheck(db: Db, id: string): Promise<CheckRow | undefined> {
  const r = await db
    .selectFrom('clearance_checks as c')
    .innerJoin('performers as p', 'p.id', 'c.performer_id')
    .leftJoin('users as u', 'u.id', 'c.run_by')
    .select([
      'c.id',
      'c.production_id',
      'c.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'c.kit_id',
      'c.run_at',
      'u.display_name',
      'c.items',
      'c.piece_ids',
      sql<string | null>`(select a.id from applications a where a.check_id = c.id limit 1)`.as('application_id'),
    ])
    .where('c.id', '=', id)
    .executeTakeFirst();
  if (!r) return undefined;
  return {
    id: r.id,
    productionId: r.production_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    kitId: r.kit_id,
    runAt: new Date(r.run_at),
    runByName: r.display_name ?? null,
    items: ItemsSchema.parse(r.items),
    pieceIds: r.piece_ids,
    applicationId: r.application_id,
  };
}

export async function insertCheck(db: Db, v: { productionId: string; performerId: string; kitId: string | null; userId: string; items: CheckItem[]; pieceIds: string[]; runAt: Date }): Promise<string> {
  const r = await db
    .insertInto('clearance_checks')
    .values({ production_id: v.productionId, performer_id: v.performerId, kit_id: v.kitId, run_by: v.userId, run_at: v.runAt, items: JSON.stringify(v.items), piece_ids: v.pieceIds })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/**
 * The formulations whose Caution the lead approved for this performer on this production: the latest
 * decision on each counts, so a later refusal takes an approval back.
 */
export async function approvedFormulations(db: Db, productionId: string, performerId: string, formulationIds: readonly string[]): Promise<Set<string>> {
  if (formulationIds.length === 0) return new Set();
  const rows = await db
    .selectFrom('lead_requests')
    .select(['formulation_id', 'status'])
    .distinctOn('formulation_id')
    .where('production_id', '=', productionId)
    .where('performer_id', '=', performerId)
    .where('formulation_id', 'in', [...new Set(formulationIds)])
    .where('status', '<>', 'waiting')
    .where('state_at_request', '=', 'caution')
    .orderBy('formulation_id')
    .orderBy('decided_at', 'desc')
    .execute();
  return new Set(rows.filter((r) => r.status === 'approved').map((r) => r.formulation_id));
}

export interface RequestBriefRow {
  id: string;
  formulationId: string;
  status: LeadRequestStatus;
  requestedAt: Date;
  decidedAt: Date | null;
  decidedByName: string | null;
}

export async function listRequestsOfCheck(db: Db, checkId: string): Promise<RequestBriefRow[]> {
  const rows = await db
    .selectFrom('lead_requests as r')
    .leftJoin('users as u', 'u.id', 'r.decided_by')
    .select(['r.id', 'r.formulation_id', 'r.status', 'r.requested_at', 'r.decided_at', 'u.display_name'])
    .where('r.check_id', '=', checkId)
    .execute();
  return rows.map((r) => ({ id: r.id, formulationId: r.formulation_id, status: r.status, requestedAt: new Date(r.requested_at), decidedAt: r.decided_at ? new Date(r.decided_at) : null, decidedByName: r.display_name ?? null }));
}

export async function insertRequest(
  db: Db,
  v: { checkId: string; productionId: string; performerId: string; productId: string; formulationId: string; state: 'caution' | 'do_not_use'; userId: string },
): Promise<string> {
  const r = await db
    .insertInto('lead_requests')
    .values({ check_id: v.checkId, production_id: v.productionId, performer_id: v.performerId, product_id: v.productId, formulation_id: v.formulationId, state_at_request: v.state, requested_by: v.userId })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export interface RequestRow {
  id: string;
  checkId: string;
  productionId: string;
  performerId: string;
  performerName: string;
  productId: string;
  productName: string;
  formulationId: string;
  stateAtRequest: 'caution' | 'do_not_use';
  requestedAt: Date;
  requestedByName: string | null;
  /** Where the artist who asked is told that the lead has answered. */
  requestedByEmail: string | null;
  status: LeadRequestStatus;
  decidedAt: Date | null;
  decidedByName: string | null;
  /** Opened here, in the repo: a health detail. */
  note: string | null;
  version: number;
  /** The check's items, for the reasons shown beside the request. */
  items: CheckItem[];
}

function requestQuery(db: Db) {
  return db
    .selectFrom('lead_requests as r')
    .innerJoin('performers as p', 'p.id', 'r.performer_id')
    .innerJoin('products as pr', 'pr.id', 'r.product_id')
    .innerJoin('clearance_checks as c', 'c.id', 'r.check_id')
    .leftJoin('users as rq', 'rq.id', 'r.requested_by')
    .leftJoin('users as dc', 'dc.id', 'r.decided_by')
    .select([
      'r.id',
      'r.check_id',
      'r.production_id',
      'r.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'r.product_id',
      'pr.name as product_name',
      'r.formulation_id',
      'r.state_at_request',
      'r.requested_at',
      'rq.display_name as requested_by_name',
      'rq.email as requested_by_email',
      'r.status',
      'r.decided_at',
      'dc.display_name as decided_by_name',
      'r.decision_note',
      'r.version',
      'c.items',
    ]);
}
type RequestSelected = Awaited<ReturnType<ReturnType<typeof requestQuery>['executeTakeFirstOrThrow']>>;

function toRequest(r: RequestSelected): RequestRow {
  return {
    id: r.id,
    checkId: r.check_id,
    productionId: r.production_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productId: r.product_id,
    productName: r.product_name,
    formulationId: r.formulation_id,
    stateAtRequest: r.state_at_request,
    requestedAt: new Date(r.requested_at),
    requestedByName: r.requested_by_name ?? null,
    requestedByEmail: r.requested_by_email ?? null,
    status: r.status,
    decidedAt: r.decided_at ? new Date(r.decided_at) : null,
    decidedByName: r.decided_by_name ?? null,
    note: r.decision_note === null ? null : openJson<string>(r.decision_note),
    version: r.version,
    items: ItemsSchema.parse(r.items),
  };
}

export async function findRequest(db: Db, id: string): Promise<RequestRow | undefined> {
  const r = await requestQuery(db).where('r.id', '=', id).executeTakeFirst();
  return r ? toRequest(r) : undefined;
}

export async function listRequests(db: Db, where: { productionIds: readonly string[]; status?: LeadRequestStatus }): Promise<RequestRow[]> {
  if (where.productionIds.length === 0) return [];
  let q = requestQuery(db).where('r.production_id', 'in', [...where.productionIds]);
  if (where.status) q = q.where('r.status', '=', where.status);
  const rows = await q.orderBy('r.requested_at', 'desc').limit(200).execute();
  return rows.map(toRequest);
}

export async function lockRequest(db: Db, id: string): Promise<{ status: LeadRequestStatus; version: number } | undefined> {
  const r = await db.selectFrom('lead_requests').select(['status', 'version']).where('id', '=', id).forUpdate().executeTakeFirst();
  return r ? { status: r.status, version: r.version } : undefined;
}

export async function decideRequest(db: Db, id: string, v: { status: 'approved' | 'refused'; note: string; userId: string; version: number }): Promise<boolean> {
  const r = await db
    .updateTable('lead_requests')
    .set((eb) => ({ status: v.status, decision_note: sealJson(v.note), decided_by: v.userId, decided_at: new Date(), version: eb('version', '+', 1) }))
    .where('id', '=', id)
    .where('version', '=', v.version)
    .where('status', '=', 'waiting')
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** How many requests wait on the lead per production. */
export async function countWaitingRequests(db: Db, productionIds: readonly string[]): Promise<number> {
  if (productionIds.length === 0) return 0;
  const r = await db.selectFrom('lead_requests').select((eb) => eb.fn.countAll<string>().as('n')).where('production_id', 'in', [...productionIds]).where('status', '=', 'waiting').executeTakeFirstOrThrow();
  return Number(r.n);
}

/** Lots of these formulations still in use and within their last day: what an application may log. */
export async function usableLots(db: Db, formulationIds: readonly string[], on: Date): Promise<{ formulationId: string; id: string; code: string; expiresOn: string }[]> {
  if (formulationIds.length === 0) return [];
  const rows = await db
    .selectFrom('product_lots')
    .select(['id', 'code', 'formulation_id', sql<string>`expires_on::text`.as('expires_on')])
    .where('formulation_id', 'in', [...new Set(formulationIds)])
    .where('retired_at', 'is', null)
    .where('expires_on', '>=', on.toISOString().slice(0, 10))
    .orderBy('expires_on')
    .orderBy('code')
    .execute();
  return rows.map((r) => ({ formulationId: r.formulation_id, id: r.id, code: r.code, expiresOn: r.expires_on }));
}
