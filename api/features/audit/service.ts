import type { Actor } from '#shared/policy.ts';
import { can } from '#shared/policy.ts';
import type { AuditPage, AuditQuery, HealthRead } from '#shared/schemas/audit.ts';
import type { AppContext } from '../../context.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { findPerformerScope } from '../performers/index.ts';
import { type AuditScope, listAuditPage, listHealthReadsOf } from './repo.ts';

const WHAT_WAS_READ: Record<string, string> = {
  consent: 'Answers on a consent form',
  consent_pdf: 'A signed consent PDF',
  health_summary: 'The health summary',
  patch_test: 'Patch-test readings',
  reading_photo: 'A reading photo',
  incident: 'A reaction report',
};

/**
 * Who has looked at this performer's health details and when: the performer sees it on their own
 * record, and so does the lead, who may read the same details.
 */
export async function healthReadsOf(ctx: AppContext, actor: Actor, performerId: string): Promise<HealthRead[]> {
  const performer = await findPerformerScope(ctx.db, performerId);
  if (!performer) throw notFound('That performer');
  authorize(actor, 'medical.read', { performerId, performerProductionIds: performer.productionIds });
  const rows = await listHealthReadsOf(ctx.db, performerId);
  return rows.map((r) => ({ at: r.at, who: r.who, what: WHAT_WAS_READ[r.entityType] ?? r.entityType.replace(/_/g, ' ') }));
}

/**
 * One page of the audit log. The administrator reads every entry; a designated lead reads the
 * entries of the productions they lead, and the entries naming no production that are about a
 * performer engaged on one of them (a change of address, a linked sign-in). Anyone else is refused.
 * A production filter must name one the reader may review.
 */
export async function auditPage(ctx: AppContext, actor: Actor, query: AuditQuery): Promise<AuditPage> {
  if (query.production) authorize(actor, 'audit.review', { productionId: query.production });
  let scope: AuditScope;
  if (can(actor, 'audit.read')) scope = { all: true };
  else {
    const productionIds = actor.leadOf.filter((productionId) => can(actor, 'audit.review', { productionId }));
    // Asked with no production: refused with the policy's words for anyone who leads none.
    if (productionIds.length === 0) authorize(actor, 'audit.review');
    scope = { all: false, productionIds };
  }
  return listAuditPage(ctx.db, query, scope, ctx.config.timeZone);
}
