import type { Request } from 'express';
import { can, type Actor } from '#shared/policy.ts';
import type { Check, LeadDecisionInput, LeadRequest } from '#shared/schemas/checks.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, forbidden, invalid, isUniqueViolation, notFound } from '../../http/errors.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findCurrentLeads, findDepartment, mailFooter } from '../productions/index.ts';
import { checkById } from './service.ts';
import { decideRequest, findCheck, findRequest, insertRequest, listRequests, lockRequest, type RequestRow } from './repo.ts';

function view(r: RequestRow, withNote: boolean): LeadRequest {
  const item = r.items.find((i) => i.formulationId === r.formulationId);
  return {
    id: r.id,
    checkId: r.checkId,
    productionId: r.productionId,
    performerId: r.performerId,
    performerName: r.performerName,
    productId: r.productId,
    productName: r.productName,
    formulationId: r.formulationId,
    stateAtRequest: r.stateAtRequest,
    reasons: item?.reasons ?? [],
    requestedAt: r.requestedAt.toISOString(),
    requestedByName: r.requestedByName,
    status: r.status,
    decidedAt: r.decidedAt?.toISOString() ?? null,
    decidedByName: r.decidedByName,
    note: withNote ? r.note : null,
    version: r.version,
  };
}

/**
 * From a Caution or Do not use in a check, the artist asks the designated lead. The lead is e-mailed a
 * link only: no performer, product or health detail travels in the message.
 */
export async function askLead(ctx: AppContext, actor: Actor, checkId: string, formulationId: string, req: Request): Promise<Check> {
  const c = await findCheck(ctx.db, checkId);
  if (!c) throw notFound('That check');
  authorize(actor, 'clearance.check', { productionId: c.productionId });
  const item = c.items.find((i) => i.formulationId === formulationId);
  if (!item) throw invalid({ formulationId: ['That product is not in this check.'] });
  if (item.state !== 'caution' && item.state !== 'do_not_use') throw invalid({ formulationId: ['Only a Caution or Do not use product needs the lead.'] });
  if (c.applicationId) throw conflict('An application has already been logged from this check; run a fresh check.');
  const id = await ctx.db
    .transaction()
    .execute(async (trx) => {
      const requestId = await insertRequest(trx, { checkId, productionId: c.productionId, performerId: c.performerId, productId: item.productId, formulationId, state: item.state as 'caution' | 'do_not_use', userId: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'lead_request.create', entityType: 'lead_request', entityId: requestId, productionId: c.productionId, performerId: c.performerId, req, details: { checkId } });
      return requestId;
    })
    .catch((err: unknown) => {
      if (isUniqueViolation(err, 'lead_requests_one_per_product')) throw conflict('The lead has already been asked about this product in this check.');
      throw err;
    });
  const [leads, dep] = await Promise.all([findCurrentLeads(ctx.db, [c.productionId]), findDepartment(ctx.db, c.productionId)]);
  const askedAt = mailDateTime(new Date(), ctx.config.timeZone);
  await deliverAll(
    ctx,
    leads.map((l) => ({
      to: l.email,
      subject: 'Plinth: a question before an application is waiting for you',
      text: [
        `Hello ${l.name},`,
        '',
        `An artist on ${dep.productionName ?? 'your production'} asked for your answer before an application, on ${askedAt}.`,
        '',
        `Open it in Plinth: ${ctx.config.appOrigin}/requests/${id}`,
        '',
        'This message carries no health details; they are in Plinth only.',
        ...mailFooter(dep),
      ].join('\n'),
    })),
  );
  return checkById(ctx, actor, checkId);
}

/** The requests of a production for its designated lead (waiting first on the home screen). */
export async function requestsFor(ctx: AppContext, actor: Actor, productionId: string, status?: LeadRequest['status']): Promise<LeadRequest[]> {
  authorize(actor, 'medical.write', { productionId });
  const rows = await listRequests(ctx.db, { productionIds: [productionId], status });
  return rows.map((r) => view(r, false));
}

/** Checks on a production with a question waiting on the lead, for the artists' home: states and plain-word reasons only. */
export async function waitingChecks(ctx: AppContext, actor: Actor, productionId: string): Promise<LeadRequest[]> {
  authorize(actor, 'clearance.check', { productionId });
  const rows = await listRequests(ctx.db, { productionIds: [productionId], status: 'waiting' });
  return rows.map((r) => view(r, false));
}

/** One request; the lead's note (a health detail) only for those who may read the performer's health data, and that read is logged. */
export async function requestById(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<LeadRequest> {
  const r = await findRequest(ctx.db, id);
  if (!r) throw notFound('That request');
  authorize(actor, 'medical.write', { productionId: r.productionId });
  const withNote = r.note !== null && can(actor, 'medical.read', { productionId: r.productionId, performerId: r.performerId });
  if (withNote) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'lead_request', entityId: id, productionId: r.productionId, performerId: r.performerId, req, details: { fields: ['note'] } });
  }
  return view(r, withNote);
}

/** The lead approves or refuses, with a note for the health record. Approving a Caution lets the check go; a Do not use stays stop. */
export async function decide(ctx: AppContext, actor: Actor, id: string, input: LeadDecisionInput, req: Request): Promise<LeadRequest> {
  const r = await findRequest(ctx.db, id);
  if (!r) throw notFound('That request');
  if (!can(actor, 'medical.write', { productionId: r.productionId, performerId: r.performerId })) throw forbidden('answer requests about a performer’s products');
  await ctx.db.transaction().execute(async (trx) => {
    const locked = await lockRequest(trx, id);
    if (!locked) throw notFound('That request');
    if (locked.status !== 'waiting') throw conflict('This request has already been answered.');
    if (locked.version !== input.version || !(await decideRequest(trx, id, { status: input.decision, note: input.note, userId: actor.userId, version: input.version }))) {
      throw conflict('Someone else changed this request since you opened it. Reload to see their change.', { currentVersion: locked.version });
    }
    await writeAudit(trx, { actorUserId: actor.userId, action: 'lead_request.decide', entityType: 'lead_request', entityId: id, productionId: r.productionId, performerId: r.performerId, req, details: { decision: input.decision } });
  });
  const fresh = (await findRequest(ctx.db, id))!;
  // The artist who asked is told there is an answer; like the lead's message, it carries a link only.
  if (fresh.requestedByEmail) {
    const dep = await findDepartment(ctx.db, r.productionId);
    await deliverAll(ctx, [
      {
        to: fresh.requestedByEmail,
        subject: 'Plinth: the designated lead has answered your question',
        text: [
          `Hello ${fresh.requestedByName ?? ''},`,
          '',
          `The designated lead on ${dep.productionName ?? 'your production'} answered a question you asked before an application, on ${mailDateTime(fresh.decidedAt ?? new Date(), ctx.config.timeZone)}.`,
          '',
          `Open the check in Plinth: ${ctx.config.appOrigin}/check?checkId=${encodeURIComponent(fresh.checkId)}`,
          '',
          'This message carries no health details; they are in Plinth only.',
          ...mailFooter(dep),
        ].join('\n'),
      },
    ]);
  }
  return view(fresh, true);
}
