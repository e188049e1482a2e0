import type { Request } from 'express';
import { opensIncident } from '#shared/domain/applications.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { Application } from '#shared/schemas/applications.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent } from '../../http/audit.ts';
import type { ApplicationRow, ProductLotRow } from './repo.ts';

/**
 * An application as this person may see it. The skin check's outcome and observation are health data:
 * only the designated lead and the performer read them (and the read is logged); others see only that
 * it was done and whether a report went to the lead.
 */
export async function applicationView(
  ctx: AppContext,
  actor: Actor,
  a: ApplicationRow,
  products: { applied: ProductLotRow[]; removal: ProductLotRow[] } | undefined,
  pieces: { id: string; number: number; buildId: string }[],
  req: Request,
): Promise<Application> {
  const resource = { productionId: a.productionId, performerId: a.performerId };
  const medical = a.skinCheck !== null && can(actor, 'medical.read', resource);
  if (medical) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'application', entityId: a.id, productionId: a.productionId, performerId: a.performerId, req, details: { fields: ['skinCheck'] } });
  }
  const logs = can(actor, 'applications.log', resource);
  return {
    id: a.id,
    productionId: a.productionId,
    performerId: a.performerId,
    performerName: a.performerName,
    artistName: a.artistName,
    appliedOn: a.appliedOn,
    description: a.description,
    startedAt: a.startedAt.toISOString(),
    endedAt: a.endedAt?.toISOString() ?? null,
    notes: a.notes,
    products: products?.applied ?? [],
    removalProducts: products?.removal ?? [],
    pieces,
    check: a.check,
    skinCheck: a.skinCheck
      ? {
          checkedAt: a.skinCheck.checkedAt.toISOString(),
          checkedByName: a.skinCheck.checkedByName,
          reportSent: opensIncident(a.skinCheck.outcome),
          outcome: medical ? a.skinCheck.outcome : null,
          observation: medical ? a.skinCheck.observation : null,
        }
      : null,
    version: a.version,
    canFinish: logs && a.endedAt === null,
    canSkinCheck: logs && a.endedAt !== null && a.skinCheck === null,
  };
}
