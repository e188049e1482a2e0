import { sql } from 'kysely';
import type { AuditPage, AuditQuery } from '#shared/schemas/audit.ts';
import { auditActionLabel } from '#shared/domain/audit.ts';
import type { Db } from '../../db/index.ts';

/** Whose entries a reader may see: every one, or those of the productions they lead (see `auditPage`). */
export type AuditScope = { all: true } | { all: false; productionIds: readonly string[] };

const UUID_TEXT = '^[0-9a-fA-F]{8}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{12}$';
/**
 * The performer an entry is about: the one it names, or the performer record it changed (entries
 * about a performer's own record, such as a change of address, name it only as their record).
 */
const subjectOf = sql<string | null>`coalesce(a.subject_performer_id, case when a.entity_type = 'performer' and a.entity_id ~ ${UUID_TEXT} then a.entity_id::uuid end)`;

const likeText = (text: string) => `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * One page of the audit log within the reader's scope, filtered by free text (actor's name or
 * address, performer's name, a record's exact id), performer, production, event or group of events
 * ("consent."), and days on the studio's clock (`timeZone`), both ends included.
 */
export async function listAuditPage(db: Db, query: AuditQuery, scope: AuditScope, timeZone: string): Promise<AuditPage> {
  let q = db
    .selectFrom('audit_log as a')
    .leftJoin('users as u', 'u.id', 'a.actor_user_id')
    .leftJoin('performers as sp', (join) => join.on(sql.ref('sp.id'), '=', subjectOf));
  if (!scope.all) {
    const ids = [...scope.productionIds];
    q = q.where((eb) =>
      eb.or([
        eb('a.production_id', '=', eb.fn<string>('any', [eb.val(ids)])),
        eb.and([
          eb('a.production_id', 'is', null),
          eb(subjectOf, 'in', db.selectFrom('engagements').select('performer_id').where('production_id', '=', eb.fn<string>('any', [eb.val(ids)]))),
        ]),
      ]),
    );
  }
  if (query.production) q = q.where('a.production_id', '=', query.production);
  if (query.performer) q = q.where(subjectOf, '=', query.performer);
  if (query.action) q = query.action.endsWith('.') ? q.where('a.action', 'like', likeText(query.action).slice(1)) : q.where('a.action', '=', query.action);
  if (query.from) q = q.where('a.at', '>=', sql<Date>`(${query.from}::date)::timestamp at time zone ${timeZone}`);
  if (query.to) q = q.where('a.at', '<', sql<Date>`(${query.to}::date + 1)::timestamp at time zone ${timeZone}`);
  if (query.q) {
    const text = likeText(query.q);
    q = q.where((eb) =>
      eb.or([
        eb('u.display_name', 'ilike', text),
        eb('u.email', 'ilike', text),
        eb('sp.legal_name', 'ilike', text),
        eb('sp.preferred_name', 'ilike', text),
        eb('a.entity_id', '=', query.q!),
      ]),
    );
  }
  const [rows, total] = await Promise.all([
    q
      .leftJoin('productions as pr', 'pr.id', 'a.production_id')
      .select(['a.id', 'a.at', 'u.display_name', 'a.action', 'a.entity_type', 'a.entity_id', 'a.production_id', 'a.details', 'pr.name as production_name'])
      .select(sql<string | null>`coalesce(sp.preferred_name, sp.legal_name)`.as('subject_name'))
      .select('sp.id as subject_id')
      .orderBy('a.at', query.dir)
      .orderBy(sql.ref('a.id'), query.dir)
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute(),
    q.select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow(),
  ]);
  return {
    items: rows.map((r) => ({
      id: String(r.id),
      at: new Date(r.at).toISOString(),
      actor: r.display_name,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      productionId: r.production_id,
      productionName: r.production_name,
      subjectName: r.subject_name,
      subjectPerformerId: r.subject_id,
      details: r.details,
    })),
    total: Number(total.n),
    page: query.page,
    pageSize: query.pageSize,
  };
}

export interface AccessEntry {
  at: string;
  who: string | null;
  action: string;
  entityType: string;
  route: string | null;
}

/** Who read a performer's health details, and when, newest first (at most 500). */
export async function listHealthReadsOf(db: Db, performerId: string): Promise<AccessEntry[]> {
  const rows = await db
    .selectFrom('audit_log as a')
    .leftJoin('users as u', 'u.id', 'a.actor_user_id')
    .select(['a.at', 'u.display_name', 'a.action', 'a.entity_type', 'a.route'])
    .where('a.subject_performer_id', '=', performerId)
    .where('a.action', '=', 'medical.read')
    .orderBy('a.at', 'desc')
    .orderBy('a.id', 'desc')
    .limit(500)
    .execute();
  return rows.map((r) => ({ at: new Date(r.at).toISOString(), who: r.display_name, action: r.action, entityType: r.entity_type, route: r.route }));
}

/** Every audit entry about a performer, oldest first: who did or read what of their records, and when. */
export async function listAuditAbout(db: Db, performerId: string) {
  const rows = await db
    .selectFrom('audit_log as a')
    .leftJoin('users as u', 'u.id', 'a.actor_user_id')
    .leftJoin('productions as pr', 'pr.id', 'a.production_id')
    .select(['a.at', 'u.display_name', 'a.action', 'a.entity_type', 'a.route', 'a.details', 'pr.name as production_name'])
    .where('a.subject_performer_id', '=', performerId)
    .orderBy('a.at')
    .orderBy('a.id')
    .execute();
  return rows.map((r) => ({ at: new Date(r.at).toISOString(), who: r.display_name, action: r.action, what: auditActionLabel(r.action), record: r.entity_type, production: r.production_name, route: r.route, details: r.details }));
}
