import type { Request } from 'express';
import { sql } from 'kysely';
import { opensIncident, type SkinCheckOutcome } from '#shared/domain/applications.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { LotTrace } from '#shared/schemas/applications.ts';
import { openJson } from '../../crypto/medical.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { recordEvent } from '../../http/audit.ts';
import { forbidden, notFound } from '../../http/errors.ts';
import { findLotsForTest } from '../catalogue/index.ts';

interface TraceRow {
  applicationId: string;
  productionId: string;
  performerId: string;
  performerName: string;
  appliedOn: string;
  use: 'applied' | 'removal' | 'in_appliance';
  artistName: string | null;
  outcome: SkinCheckOutcome | null;
  observation: string | null;
}

/**
 * Every application that used a lot, with its performer and skin check: applied or in removal, or
 * inside an appliance piece worn for it (the lot went into the piece's build). One query.
 */
async function listLotUses(db: Db, lotId: string): Promise<TraceRow[]> {
  const direct = db
    .selectFrom('application_products as ap')
    .where('ap.lot_id', '=', lotId)
    .select(['ap.application_id', sql<TraceRow['use']>`ap.use::text`.as('use')]);
  const inPieces = db
    .selectFrom('appliance_build_materials as m')
    .innerJoin('appliance_pieces as pc', 'pc.build_id', 'm.build_id')
    .where('m.lot_id', '=', lotId)
    .where('pc.application_id', 'is not', null)
    .select([sql<string>`pc.application_id`.as('application_id'), sql<TraceRow['use']>`'in_appliance'`.as('use')])
    .distinct();
  const rows = await db
    .selectFrom(direct.unionAll(inPieces).as('ap'))
    .innerJoin('applications as a', 'a.id', 'ap.application_id')
    .innerJoin('performers as p', 'p.id', 'a.performer_id')
    .leftJoin('users as u', 'u.id', 'a.artist_id')
    .leftJoin('skin_checks as s', 's.application_id', 'a.id')
    .select([
      'a.id',
      'a.production_id',
      'a.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      sql<string>`a.applied_on::text`.as('applied_on'),
      'ap.use',
      'u.display_name',
      's.outcome',
      's.observation',
    ])
    .orderBy('a.applied_on', 'desc')
    .orderBy('a.id')
    .execute();
  return rows.map((r) => ({
    applicationId: r.id,
    productionId: r.production_id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    appliedOn: r.applied_on,
    use: r.use,
    artistName: r.display_name ?? null,
    outcome: r.outcome ? openJson<SkinCheckOutcome>(r.outcome) : null,
    observation: r.observation ? openJson<string>(r.observation) : null,
  }));
}

/**
 * A lot's trace for a recall or a cluster of reactions: every performer and application it touched, on
 * the productions where this person may trace lots. Skin-check outcomes and observations only where
 * they may read the performer's health data (the lead), and each such read is logged.
 */
export async function traceLot(ctx: AppContext, actor: Actor, lotId: string, req: Request): Promise<LotTrace> {
  const lot = (await findLotsForTest(ctx.db, [lotId])).get(lotId);
  if (!lot) throw notFound('That lot');
  const uses = await listLotUses(ctx.db, lotId);
  const traceable = (productionId: string) => can(actor, 'lots.trace', { productionId });
  const anywhere = actor.memberships.some((m) => traceable(m.productionId)) || actor.leadOf.some(traceable);
  if (!anywhere) throw forbidden('trace a lot to the performers it touched');
  const visible = uses.filter((u) => traceable(u.productionId));
  const medicalFor = (u: TraceRow) => can(actor, 'medical.read', { productionId: u.productionId, performerId: u.performerId });
  const readPerformers = new Set(visible.filter((u) => u.outcome !== null && medicalFor(u)).map((u) => u.performerId));
  for (const performerId of readPerformers) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'lot', entityId: lotId, performerId, req, details: { fields: ['skinCheck'] } });
  }
  const performers = new Map<string, { id: string; name: string; applications: number }>();
  const counted = new Set<string>();
  for (const u of visible) {
    const p = performers.get(u.performerId) ?? performers.set(u.performerId, { id: u.performerId, name: u.performerName, applications: 0 }).get(u.performerId)!;
    // One application that used the lot twice (applied, and in a piece) counts once.
    if (!counted.has(u.applicationId)) p.applications++;
    counted.add(u.applicationId);
  }
  return {
    lot: { id: lot.lotId, code: lot.code, productId: lot.productId, productName: lot.productName, expiresOn: lot.expiresOn ?? '' },
    medical: readPerformers.size > 0 || visible.every(medicalFor),
    applications: visible.map((u) => {
      const medical = medicalFor(u);
      return {
        applicationId: u.applicationId,
        productionId: u.productionId,
        performerId: u.performerId,
        performerName: u.performerName,
        appliedOn: u.appliedOn,
        use: u.use,
        artistName: u.artistName,
        reportSent: u.outcome !== null && opensIncident(u.outcome),
        outcome: medical ? u.outcome : null,
        observation: medical ? u.observation : null,
      };
    }),
    performers: [...performers.values()],
  };
}
