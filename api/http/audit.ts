import type { Request } from 'express';
import type { Db } from '../db/index.ts';

export interface AuditEvent {
  actorUserId: string | null;
  /** The performer who acted through a one-time link, with no sign-in. */
  actorPerformerId?: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  productionId?: string | null;
  details?: Record<string, unknown>;
  req?: Request;
}

/** Appends to the audit log; pass the transaction so the record and its audit entry land together. */
export async function writeAudit(db: Db, e: AuditEvent): Promise<void> {
  await db
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
    })
    .execute();
}
