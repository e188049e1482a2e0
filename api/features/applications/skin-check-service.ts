import type { Request } from 'express';
import { opensIncident } from '#shared/domain/applications.ts';
import type { Actor } from '#shared/policy.ts';
import type { Application, Incident, SkinCheckInput } from '#shared/schemas/applications.ts';
import { SkinCheckInputSchema } from '#shared/schemas/applications.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, isUniqueViolation, notFound } from '../../http/errors.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findCurrentLeads, findDepartment, mailFooter } from '../productions/index.ts';
import { closeIncidentAtVersion, findIncident, insertIncident, listIncidents, type IncidentRow } from './incident-repo.ts';
import { insertSkinCheck, listApplicationProducts, lockApplication } from './repo.ts';
import { applicationById } from './service.ts';

/**
 * The skin check after removal, once per application and only once it has ended. Anything but clear
 * opens an incident for the designated lead, who is e-mailed a link with no health detail in it. The
 * artist then sees that the report was sent, never what it says.
 */
export async function recordSkinCheck(ctx: AppContext, actor: Actor, applicationId: string, raw: SkinCheckInput, req: Request): Promise<Application> {
  const input = SkinCheckInputSchema.parse(raw);
  const incidentId = await ctx.db
    .transaction()
    .execute(async (trx) => {
      const a = await lockApplication(trx, applicationId);
      if (!a) throw notFound('That application');
      authorize(actor, 'applications.log', { productionId: a.productionId });
      if (!a.endedAt) throw conflict('Record the end of the application (its removal) before the skin check.');
      if (a.skinChecked) throw conflict('The skin check after this application is already recorded.');
      await insertSkinCheck(trx, { applicationId, outcome: input.outcome, observation: input.outcome === 'clear' ? null : input.observation, userId: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'skin_check.record', entityType: 'application', entityId: applicationId, productionId: a.productionId, performerId: a.performerId, req });
      if (!opensIncident(input.outcome)) return null;
      const id = await insertIncident(trx, { applicationId, productionId: a.productionId, performerId: a.performerId, userId: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'incident.open', entityType: 'incident', entityId: id, productionId: a.productionId, performerId: a.performerId, req, details: { applicationId } });
      return { id, productionId: a.productionId };
    })
    .catch((err: unknown) => {
      if (isUniqueViolation(err, 'skin_checks_pkey')) throw conflict('The skin check after this application is already recorded.');
      throw err;
    });
  if (incidentId) {
    const [leads, dep] = await Promise.all([findCurrentLeads(ctx.db, [incidentId.productionId]), findDepartment(ctx.db, incidentId.productionId)]);
    const reportedAt = mailDateTime(new Date(), ctx.config.timeZone);
    await deliverAll(
      ctx,
      leads.map((l) => ({
        to: l.email,
        subject: 'Plinth: a skin check after an application needs your attention',
        text: [
          `Hello ${l.name},`,
          '',
          `An artist on ${dep.productionName ?? 'your production'} reported a skin check after an application that was not clear, on ${reportedAt}.`,
          '',
          `Open the report in Plinth: ${ctx.config.appOrigin}/incidents/${incidentId.id}`,
          '',
          'This message carries no health details; they are in Plinth only.',
          ...mailFooter(dep),
        ].join('\n'),
      })),
    );
  }
  return applicationById(ctx, actor, applicationId, req);
}

async function incidentView(ctx: AppContext, rows: readonly IncidentRow[]): Promise<Incident[]> {
  const products = await listApplicationProducts(
    ctx.db,
    rows.map((r) => r.applicationId),
  );
  return rows.map((r) => ({
    id: r.id,
    applicationId: r.applicationId,
    productionId: r.productionId,
    performerId: r.performerId,
    performerName: r.performerName,
    reportedAt: r.reportedAt.toISOString(),
    reportedByName: r.reportedByName,
    status: r.status,
    outcome: r.outcome,
    observation: r.observation,
    products: products.get(r.applicationId)?.applied ?? [],
    removalProducts: products.get(r.applicationId)?.removal ?? [],
    closedAt: r.closedAt?.toISOString() ?? null,
    closingNote: r.closingNote,
    version: r.version,
  }));
}

/** What an incident shows its reader of the performer's health. */
const INCIDENT_FIELDS = ['outcome', 'observation', 'closingNote'];

/** A production's incidents for its designated lead: health details, so each performer's read is logged. */
export async function incidentsFor(ctx: AppContext, actor: Actor, productionId: string, status: 'open' | 'closed' | undefined, req: Request): Promise<Incident[]> {
  authorize(actor, 'medical.read', { productionId });
  const rows = await listIncidents(ctx.db, { productionIds: [productionId], status });
  for (const performerId of new Set(rows.map((r) => r.performerId))) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'incident', productionId, performerId, req, details: { fields: INCIDENT_FIELDS, incidents: rows.filter((r) => r.performerId === performerId).map((r) => r.id) } });
  }
  return incidentView(ctx, rows);
}

export async function incidentById(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Incident> {
  const r = await findIncident(ctx.db, id);
  if (!r) throw notFound('That incident');
  authorize(actor, 'medical.read', { productionId: r.productionId, performerId: r.performerId });
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'incident', entityId: id, productionId: r.productionId, performerId: r.performerId, req, details: { fields: INCIDENT_FIELDS } });
  return (await incidentView(ctx, [r]))[0]!;
}

/** The lead closes an incident with a note for the health record. */
export async function closeIncident(ctx: AppContext, actor: Actor, id: string, input: { note: string; version: number }, req: Request): Promise<Incident> {
  const r = await findIncident(ctx.db, id);
  if (!r) throw notFound('That incident');
  authorize(actor, 'medical.write', { productionId: r.productionId, performerId: r.performerId });
  await ctx.db.transaction().execute(async (trx) => {
    if (r.status !== 'open') throw conflict('This incident is already closed.');
    if (!(await closeIncidentAtVersion(trx, id, { note: input.note, userId: actor.userId, version: input.version }))) {
      throw conflict('Someone else changed this incident since you opened it. Reload to see their change.', { currentVersion: r.version });
    }
    await writeAudit(trx, { actorUserId: actor.userId, action: 'incident.close', entityType: 'incident', entityId: id, productionId: r.productionId, performerId: r.performerId, req });
  });
  return incidentById(ctx, actor, id, req);
}
