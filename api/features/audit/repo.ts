import { sql } from 'kysely';
import type { AuditPage, AuditQuery } from '#shared/schemas/admin.ts';
import { auditActionLabel } from '#shared/domain/audit.ts';
import type { Db } from '../../db/index.ts';

/** One page of the audit log, filtered by event prefix and by actor name or record id. */
export async function listAuditPage(db: Db, query: AuditQuery): Promise<AuditPage> {
  let q = db.selectFrom('audit_log as a').leftJoin('users as u', 'u.id', 'a.actor_user_id');
  if (query.action) q = q.where('a.action', 'like', `${query.action.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
  if (query.q) q = q.where((eb) => eb.or([eb('u.display_name', 'ilike', `%${query.q}%`), eb('a.entity_id', '=', query.q!)]));
  const [rows, total] = await Promise.all([
    q
      .leftJoin('productions as pr', 'pr.id', 'a.production_id')
      .leftJoin('performers as sp', 'sp.id', 'a.subject_performer_id')
      .select(['a.id', 'a.at', 'u.display_name', 'a.action', 'a.entity_type', 'a.entity_id', 'a.production_id', 'a.details', 'pr.name as production_name'])
      .select(sql<string | null>`coalesce(sp.preferred_name, sp.legal_name)`.as('subject_name'))
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
