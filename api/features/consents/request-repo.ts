import { sql } from 'kysely';
import type { ConsentKind } from '#shared/domain/consent.ts';
import type { SigningRequest } from '#shared/schemas/consents.ts';
import type { Db } from '../../db/index.ts';

export type RequestStatus = 'open' | 'signed' | 'cancelled';

/** A signing request with its performer and the current version of its form. */
export interface RequestRecord {
  id: string;
  mode: 'tablet' | 'link';
  status: RequestStatus;
  expiresAt: Date;
  createdAt: Date;
  performerId: string;
  performerName: string;
  productionId: string | null;
  templateId: string;
  title: string;
  kind: ConsentKind;
  /** The performer's address on record (where a link request was sent). */
  email: string | null;
  /** The form was taken out of use after the request was made. */
  archived: boolean;
  bundleId: string | null;
  bundlePosition: number | null;
}

function requestQuery(db: Db) {
  return db
    .selectFrom('signing_requests as r')
    .innerJoin('performers as p', 'p.id', 'r.performer_id')
    .innerJoin('consent_templates as t', 't.id', 'r.template_id')
    .innerJoin('consent_template_versions as v', (j) => j.onRef('v.template_id', '=', 't.id').onRef('v.version', '=', 't.current_version'))
    .select([
      'r.id',
      'r.mode',
      'r.status',
      'r.expires_at',
      'r.created_at',
      'r.performer_id',
      'r.production_id',
      'r.template_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'p.email',
      'v.title',
      't.kind',
      't.archived',
      'r.bundle_id',
      'r.bundle_position',
    ]);
}
type Row = Awaited<ReturnType<ReturnType<typeof requestQuery>['executeTakeFirstOrThrow']>>;

function toRecord(r: Row): RequestRecord {
  return {
    id: r.id,
    mode: r.mode,
    status: r.status,
    expiresAt: new Date(r.expires_at),
    createdAt: new Date(r.created_at),
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    templateId: r.template_id,
    title: r.title,
    kind: r.kind,
    email: r.email,
    archived: r.archived,
    bundleId: r.bundle_id,
    bundlePosition: r.bundle_position,
  };
}

/** The request as the department sees it; an open one past its time reads as expired. */
export function toSigningRequest(r: RequestRecord, now = Date.now()): SigningRequest {
  const expired = r.status === 'open' && r.expiresAt.getTime() <= now;
  return {
    id: r.id,
    mode: r.mode,
    status: expired ? 'expired' : r.status,
    expiresAt: r.expiresAt.toISOString(),
    createdAt: r.createdAt.toISOString(),
    performer: { id: r.performerId, name: r.performerName },
    template: { id: r.templateId, title: r.title, kind: r.kind },
    sentTo: r.mode === 'link' ? r.email : null,
  };
}

export async function findRequest(db: Db, id: string): Promise<RequestRecord | undefined> {
  const r = await requestQuery(db).where('r.id', '=', id).executeTakeFirst();
  return r ? toRecord(r) : undefined;
}

/** The requests of one bundle, in the order they are signed. */
export async function listBundleRequests(db: Db, bundleId: string): Promise<RequestRecord[]> {
  return (await requestQuery(db).where('r.bundle_id', '=', bundleId).orderBy('r.bundle_position').execute()).map(toRecord);
}

export async function findLinkRequestByTokenHash(db: Db, tokenHash: string): Promise<RequestRecord | undefined> {
  const r = await requestQuery(db).where('r.token_hash', '=', tokenHash).where('r.mode', '=', 'link').executeTakeFirst();
  return r ? toRecord(r) : undefined;
}

export async function listRequests(db: Db, where: { productionId: string; performerId?: string; status?: RequestStatus }): Promise<RequestRecord[]> {
  let q = requestQuery(db).where('r.production_id', '=', where.productionId);
  if (where.performerId) q = q.where('r.performer_id', '=', where.performerId);
  if (where.status) q = q.where('r.status', '=', where.status);
  return (await q.orderBy('r.created_at', 'desc').limit(200).execute()).map(toRecord);
}

export async function insertRequest(
  db: Db,
  v: { performerId: string; productionId: string; templateId: string; mode: 'tablet' | 'link'; tokenHash: string | null; expiresAt: Date; createdBy: string; bundleId?: string; bundlePosition?: number },
): Promise<string> {
  const r = await db
    .insertInto('signing_requests')
    .values({
      performer_id: v.performerId,
      production_id: v.productionId,
      template_id: v.templateId,
      mode: v.mode,
      token_hash: v.tokenHash,
      expires_at: v.expiresAt,
      created_by: v.createdBy,
      bundle_id: v.bundleId ?? null,
      bundle_position: v.bundlePosition ?? null,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Cancels only while still open: a signing that lands first wins over a racing cancel. */
export async function cancelOpenRequest(db: Db, id: string): Promise<boolean> {
  const done = await db.updateTable('signing_requests').set({ status: 'cancelled' }).where('id', '=', id).where('status', '=', 'open').executeTakeFirst();
  return Number(done.numUpdatedRows) === 1;
}

export async function markRequestOpened(db: Db, id: string, opts: { keepFirst?: boolean } = {}): Promise<void> {
  await db
    .updateTable('signing_requests')
    .set({ opened_at: opts.keepFirst ? sql`coalesce(opened_at, now())` : new Date() })
    .where('id', '=', id)
    .execute();
}

/** The request row lock serialises submissions for one form: a double tap cannot sign twice. */
export async function lockRequestStatus(db: Db, id: string): Promise<RequestStatus> {
  return (await db.selectFrom('signing_requests').select('status').where('id', '=', id).forUpdate().executeTakeFirstOrThrow()).status;
}

export async function markRequestSigned(db: Db, id: string, at: Date): Promise<void> {
  await db.updateTable('signing_requests').set({ status: 'signed', signed_at: at }).where('id', '=', id).execute();
}

/** Link requests of the production still open, as a one-column query (`n`) for a counts statement. */
export function openLinkRequestsCount(db: Db, productionId: string, now: Date) {
  return db
    .selectFrom('signing_requests')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('production_id', '=', productionId)
    .where('status', '=', 'open')
    .where('mode', '=', 'link')
    .where('expires_at', '>', now);
}

// ---- withdrawal links

export async function findWithdrawalLinkByHash(db: Db, tokenHash: string): Promise<{ id: string; performerId: string; expiresAt: Date } | undefined> {
  const l = await db.selectFrom('withdrawal_links').select(['id', 'performer_id', 'expires_at']).where('token_hash', '=', tokenHash).executeTakeFirst();
  return l ? { id: l.id, performerId: l.performer_id, expiresAt: new Date(l.expires_at) } : undefined;
}

export async function countRecentWithdrawalLinks(db: Db, performerId: string, since: Date): Promise<number> {
  const row = await db.selectFrom('withdrawal_links').select((eb) => eb.fn.countAll<string>().as('n')).where('performer_id', '=', performerId).where('created_at', '>', since).executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function insertWithdrawalLink(db: Db, performerId: string, tokenHash: string, expiresAt: Date): Promise<void> {
  await db.insertInto('withdrawal_links').values({ performer_id: performerId, token_hash: tokenHash, expires_at: expiresAt }).execute();
}

export async function markWithdrawalLinkUsed(db: Db, id: string): Promise<void> {
  await db.updateTable('withdrawal_links').set({ used_at: sql`coalesce(used_at, now())` }).where('id', '=', id).execute();
}

/** A performer's open requests still in time, newest first: what waits for them to sign. */
export async function listOpenRequestsForPerformer(db: Db, performerId: string, now: Date): Promise<RequestRecord[]> {
  const rows = await requestQuery(db).where('r.performer_id', '=', performerId).where('r.status', '=', 'open').where('r.expires_at', '>', now).orderBy('r.created_at', 'desc').limit(20).execute();
  return rows.map(toRecord);
}
