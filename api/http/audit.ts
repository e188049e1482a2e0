import type { Request } from 'express';
import type { Transaction } from 'kysely';
import type { AuditAction } from '#shared/domain/audit.ts';
import type { Db } from '../db/index.ts';
import type { Database } from '../db/schema.ts';

/** A database transaction: the only handle an audit entry may be written with. */
export type Trx = Transaction<Database>;

export interface AuditEvent {
  actorUserId: string | null;
  /** The performer who acted through a one-time link, with no sign-in. */
  actorPerformerId?: string | null;
  action: AuditAction;
  /** Whose record this is about, when it is a performer's (medical reads always say). */
  performerId?: string | null;
  entityType: string;
  entityId?: string | null;
  productionId?: string | null;
  details?: Record<string, unknown>;
  req?: Request;
}

/**
 * Appends to the audit log inside the transaction of the change it records, so the record and its
 * entry land together or not at all. Typed to refuse the pool itself.
 */
export async function writeAudit(trx: Trx, e: AuditEvent): Promise<void> {
  await trx
    .insertInto('audit_log')
    .values({
      actor_user_id: e.actorUserId,
      actor_performer_id: e.actorPerformerId ?? null,
      action: e.action,
      entity_type: e.entityType,
      entity_id: e.entityId ?? null,
      production_id: e.productionId ?? null,
      details: JSON.stringify(e.details ?? {}),
      ip: e.req?.ip ?? null,
      subject_performer_id: e.performerId ?? null,
      route: e.req ? routeOf(e.req) : null,
    })
    .execute();
}

/**
 * An event that changes nothing else (a read of health details, a sign-in, a check): written in
 * a transaction of its own.
 */
export async function recordEvent(db: Db, e: AuditEvent): Promise<void> {
  await db.transaction().execute((trx) => writeAudit(trx, e));
}

/** The route pattern a request matched ("GET /api/consents/:id"), never its concrete URL: no ids or tokens. */
function routeOf(req: Request): string | null {
  const path = (req.route as { path?: unknown } | undefined)?.path;
  return typeof path === 'string' ? `${req.method} ${path}` : null;
}
