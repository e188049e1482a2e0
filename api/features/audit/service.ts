import type { Actor } from '#shared/policy.ts';
import type { HealthRead } from '#shared/schemas/audit.ts';
import type { AppContext } from '../../context.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { findPerformerScope } from '../performers/index.ts';
import { listHealthReadsOf } from './repo.ts';

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
