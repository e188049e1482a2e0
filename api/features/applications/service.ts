import type { Request } from 'express';
import { changedSinceCheck, endBeforeStart } from '#shared/domain/applications.ts';
import { lotRefusal } from '#shared/domain/catalogue.ts';
import { CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { coversMoment } from '#shared/domain/consent.ts';
import type { Actor } from '#shared/policy.ts';
import type { Application, FinishApplicationInput, LogApplicationInput, ProductLotInput } from '#shared/schemas/applications.ts';
import { FinishApplicationInputSchema, LogApplicationInputSchema } from '#shared/schemas/applications.ts';
import type { CheckItem } from '#shared/schemas/checks.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { ApiError, conflict, invalid, notFound } from '../../http/errors.ts';
import { listPiecesWornFor, markPiecesWornFor } from '../builds/index.ts';
import { findLotsForTest } from '../catalogue/index.ts';
import { answersFor, approvedFormulations, findCheck, judge, listRequestsOfCheck } from '../checks/index.ts';
import { listConsentsForGate } from '../consents/index.ts';
import { applicationView } from './view.ts';
import { applicationOfCheck, countRemovalProducts, findApplication, insertApplication, insertApplicationProducts, listApplicationProducts, listApplicationRows, lockApplication, setEndedAtVersion } from './repo.ts';

/** An application with its products, pieces and skin check, as this person may see it. */
export async function applicationById(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Application> {
  const a = await findApplication(ctx.db, id);
  if (!a) throw notFound('That application');
  authorize(actor, 'applications.read', { productionId: a.productionId });
  const [products, pieces] = await Promise.all([listApplicationProducts(ctx.db, [id]), listPiecesWornFor(ctx.db, [id])]);
  return applicationView(ctx, actor, a, products.get(id), pieces.get(id) ?? [], req);
}

/** The applications of a production (a day's, or a performer's), newest first. */
export async function listApplications(ctx: AppContext, actor: Actor, q: { productionId: string; day?: string; performerId?: string }) {
  authorize(actor, 'applications.read', { productionId: q.productionId });
  const rows = await listApplicationRows(ctx.db, { productionIds: [q.productionId], day: q.day, performerId: q.performerId });
  return rows.map((a) => ({
    id: a.id,
    performerId: a.performerId,
    performerName: a.performerName,
    artistName: a.artistName,
    appliedOn: a.appliedOn,
    description: a.description,
    startedAt: a.startedAt.toISOString(),
    endedAt: a.endedAt?.toISOString() ?? null,
    skinChecked: a.skinCheck !== null,
  }));
}

interface CheckedLot {
  productId: string;
  lotId: string;
  formulationId: string;
}

/** Each product must have been in the check, with a lot of it, in date on the day, of the formulation the check answered for. */
async function checkedLots(db: Db, items: readonly CheckItem[], lists: { products: readonly ProductLotInput[]; removalProducts: readonly ProductLotInput[] }, on: Date): Promise<{ applied: CheckedLot[]; removal: CheckedLot[] }> {
  const lots = await findLotsForTest(db, [...lists.products, ...lists.removalProducts].map((p) => p.lotId));
  const byProduct = new Map(items.map((i) => [i.productId, i]));
  const fields: Record<string, string[]> = {};
  const out = { applied: [] as CheckedLot[], removal: [] as CheckedLot[] };
  for (const [key, list, use] of [['products', lists.products, 'applied'], ['removalProducts', lists.removalProducts, 'removal']] as const) {
    list.forEach((p, i) => {
      const item = byProduct.get(p.productId);
      const lot = lots.get(p.lotId);
      if (!item) {
        fields[`${key}.${i}.productId`] = ['This product was not in the check. Run the check with it first.'];
        return;
      }
      const refusal = lotRefusal(lot ? { ...lot, retiredAt: lot.retiredAt } : undefined, p.productId, on, 'on a performer');
      if (refusal) fields[`${key}.${i}.lotId`] = [refusal];
      else if (lot!.formulationId !== item.formulationId) fields[`${key}.${i}.lotId`] = [`Lot ${lot!.code} is of another formulation than the one the check answered for.`];
      else out[use].push({ productId: p.productId, lotId: p.lotId, formulationId: lot!.formulationId });
    });
  }
  if (Object.keys(fields).length) throw invalid(fields);
  return out;
}

/**
 * Logs an application from a check. Refused without an active application consent given to the
 * production; refused (409) when any product's clearance is no longer what the check showed, or the
 * check says stop. The check's answer is frozen onto the entry.
 */
export async function logApplication(ctx: AppContext, actor: Actor, raw: LogApplicationInput, req: Request): Promise<Application> {
  const input = LogApplicationInputSchema.parse(raw);
  const check = await findCheck(ctx.db, input.checkId);
  if (!check) throw notFound('That check');
  authorize(actor, 'applications.log', { productionId: check.productionId });
  const startedAt = new Date(input.startedAt);
  const endedAt = input.endedAt ? new Date(input.endedAt) : null;
  if (endBeforeStart(startedAt, endedAt)) throw invalid({ endedAt: ['The end cannot be before the start.'] });
  const unknownPieces = input.pieceIds.filter((id) => !check.pieceIds.includes(id));
  if (unknownPieces.length) throw invalid({ pieceIds: ['Only appliance pieces the check covered can be logged.'] });
  const lots = await checkedLots(ctx.db, check.items, input, startedAt);

  const consents = await listConsentsForGate(ctx.db, [check.performerId]);
  const consented = consents.some((c) => c.kind === 'application' && (c.productionId === null || c.productionId === check.productionId) && coversMoment(c, startedAt));
  if (!consented) throw conflict(`${check.performerName} has no active application consent given to this production. Ask them to sign one before logging the application.`);
  if (check.applicationId || (await applicationOfCheck(ctx.db, check.id))) throw conflict('An application has already been logged from this check. Run a fresh check for another.');

  // The clearance now, against what the check showed.
  const productIds = check.items.filter((i) => i.fromPieceIds.length === 0).map((i) => i.productId);
  const materials = new Map(check.items.filter((i) => i.fromPieceIds.length > 0).map((i) => [i.formulationId, { productId: i.productId, pieceIds: i.fromPieceIds }]));
  const [fresh, approved, requests] = await Promise.all([
    answersFor(ctx.db, check.performerId, { productIds, materials }, new Date()),
    approvedFormulations(
      ctx.db,
      check.productionId,
      check.performerId,
      check.items.map((i) => i.formulationId),
    ),
    listRequestsOfCheck(ctx.db, check.id),
  ]);
  const changed = changedSinceCheck(check.items, fresh);
  if (changed.length) {
    const now = new Map(fresh.map((r) => [r.formulationId, r.state]));
    const words = changed.map((c) => `${c.productName} (${CLEARANCE_STATE_LABELS[c.state]} at the check, ${now.has(c.formulationId) ? CLEARANCE_STATE_LABELS[now.get(c.formulationId)!] : 'a new formulation'} now)`);
    throw new ApiError('conflict', `A clearance changed since the check: ${words.join(', ')}. Run the check again before logging.`, { changed: changed.map((c) => c.formulationId) });
  }
  const judged = judge(check.items, approved, requests);
  if (judged.verdict !== 'go') throw conflict(`The check says stop, so the application cannot be logged. ${judged.message}`);

  const id = await ctx.db.transaction().execute(async (trx) => {
    const appId = await insertApplication(trx, {
      productionId: check.productionId,
      performerId: check.performerId,
      checkId: check.id,
      artistId: actor.userId,
      appliedOn: input.appliedOn,
      description: input.description,
      startedAt,
      endedAt,
      notes: input.notes,
      snapshot: { id: check.id, runAt: check.runAt.toISOString(), verdict: judged.verdict, message: judged.message, items: judged.items },
    });
    await insertApplicationProducts(trx, appId, 'applied', lots.applied);
    await insertApplicationProducts(trx, appId, 'removal', lots.removal);
    const refused = await markPiecesWornFor(trx, input.pieceIds, appId, actor.userId);
    if (refused.length) throw invalid({ pieceIds: ['A piece is spoiled or was already worn for another application.'] });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'application.log', entityType: 'application', entityId: appId, productionId: check.productionId, performerId: check.performerId, req, details: { checkId: check.id, products: lots.applied.length, pieces: input.pieceIds.length } });
    return appId;
  });
  return applicationById(ctx, actor, id, req);
}

/** Records when the application came off and with what. An application already ended cannot end again. */
export async function finishApplication(ctx: AppContext, actor: Actor, id: string, raw: FinishApplicationInput, req: Request): Promise<Application> {
  const input = FinishApplicationInputSchema.parse(raw);
  const a = await findApplication(ctx.db, id);
  if (!a) throw notFound('That application');
  authorize(actor, 'applications.log', { productionId: a.productionId });
  const endedAt = new Date(input.endedAt);
  if (endBeforeStart(a.startedAt, endedAt)) throw invalid({ endedAt: ['The end cannot be before the start.'] });
  const lots = await checkedLots(ctx.db, a.check.items, { products: [], removalProducts: input.removalProducts }, endedAt);
  await ctx.db.transaction().execute(async (trx) => {
    const locked = await lockApplication(trx, id);
    if (!locked) throw notFound('That application');
    if (locked.endedAt) throw conflict('The end of this application is already recorded.');
    if (locked.version !== input.version || !(await setEndedAtVersion(trx, id, endedAt, input.version))) {
      throw conflict('Someone else changed this application since you opened it. Reload to see their change.', { currentVersion: locked.version });
    }
    await insertApplicationProducts(trx, id, 'removal', lots.removal, await countRemovalProducts(trx, id));
    await writeAudit(trx, { actorUserId: actor.userId, action: 'application.finish', entityType: 'application', entityId: id, productionId: a.productionId, performerId: a.performerId, req, details: { removalProducts: lots.removal.length } });
  });
  return applicationById(ctx, actor, id, req);
}

