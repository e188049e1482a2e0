import type { Request } from 'express';
import { checkVerdict } from '#shared/domain/check-verdict.ts';
import type { ClearanceResult } from '#shared/domain/clearance.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { Check, CheckItem, CheckItemView, RunCheckInput } from '#shared/schemas/checks.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { findApplianceMaterials } from '../builds/index.ts';
import { existingProductIds } from '../kits/index.ts';
import { clearancesFor } from './clearance-source.ts';
import { approvedFormulations, findCheck, findKitProducts, findPerformerForCheck, insertCheck, listRequestsOfCheck, usableLots, type CheckRow, type RequestBriefRow } from './repo.ts';

/** A clearance answer as the check keeps it: states and plain-word reasons, never a grade or note. */
function itemOf(r: ClearanceResult, fromPieceIds: string[]): CheckItem {
  return {
    productId: r.productId,
    productName: r.productName,
    formulationId: r.formulationId,
    state: r.state,
    reasons: r.reasons.map((x) => ({ code: x.code, text: x.text })),
    validUntil: r.validUntil?.toISOString() ?? null,
    retestAdvised: r.retestAdvised,
    overridden: r.overridden,
    fromPieceIds,
  };
}

/** What `checkVerdict` needs of a kept item. */
function asResult(i: CheckItem): ClearanceResult {
  return { ...i, validUntil: i.validUntil ? new Date(i.validUntil) : null, override: null, computedState: i.state, reasons: i.reasons as ClearanceResult['reasons'] };
}

/** The verdict over kept items with the approvals in force now, each item with its request to the lead. */
export function judge(items: readonly CheckItem[], approved: ReadonlySet<string>, requests: readonly RequestBriefRow[]): { verdict: 'go' | 'stop'; message: string; items: CheckItemView[] } {
  const v = checkVerdict(items.map(asResult), [...approved].map((formulationId) => ({ formulationId })));
  const byFormulation = new Map(requests.map((r) => [r.formulationId, r]));
  return {
    verdict: v.verdict,
    message: v.message,
    items: items.map((item, i) => {
      const r = byFormulation.get(item.formulationId);
      return {
        ...item,
        approved: v.items[i]!.approved,
        go: v.items[i]!.go,
        request: r ? { id: r.id, status: r.status, requestedAt: r.requestedAt.toISOString(), decidedAt: r.decidedAt?.toISOString() ?? null, decidedByName: r.decidedByName } : null,
      };
    }),
  };
}

function view(actor: Actor, c: CheckRow, approved: ReadonlySet<string>, requests: readonly RequestBriefRow[], lots: Check['lots']): Check {
  const judged = judge(c.items, approved, requests);
  const resource = { productionId: c.productionId };
  return {
    id: c.id,
    productionId: c.productionId,
    performerId: c.performerId,
    performerName: c.performerName,
    kitId: c.kitId,
    runAt: c.runAt.toISOString(),
    runByName: c.runByName,
    verdict: judged.verdict,
    message: judged.message,
    items: judged.items,
    pieceIds: c.pieceIds,
    canAskLead: can(actor, 'clearance.check', resource),
    canLog: can(actor, 'applications.log', resource),
    applicationId: c.applicationId,
    lots,
  };
}

export interface PlannedProducts {
  /** Product ids answered at their current formulation, in the order chosen. */
  productIds: string[];
  /** Formulations of appliance materials, with the pieces each came from. */
  materials: Map<string, { productId: string; pieceIds: string[] }>;
}

/** The products to clear: those chosen, the kit's, and the materials of the appliance pieces, each once. */
async function plannedProducts(db: Db, input: { productionId: string; performerId: string; productIds: string[]; kitId?: string | null; pieceIds: string[] }): Promise<PlannedProducts> {
  const [kit, known, uses] = await Promise.all([
    input.kitId ? findKitProducts(db, input.kitId) : Promise.resolve(undefined),
    existingProductIds(db, input.productIds),
    findApplianceMaterials(db, { pieceIds: input.pieceIds }),
  ]);
  const fields: Record<string, string[]> = {};
  input.productIds.forEach((id, i) => {
    if (!known.has(id)) fields[`productIds.${i}`] = ['No such product in the catalogue.'];
  });
  if (input.kitId && (!kit || kit.productionId !== input.productionId)) fields.kitId = ['No such kit on this production.'];
  else if (kit && kit.productIds.length === 0) fields.kitId = ['This kit has no products.'];
  const found = new Map<string, (typeof uses)[number]>();
  for (const u of uses) for (const p of u.pieceIds) found.set(p, u);
  input.pieceIds.forEach((id, i) => {
    const u = found.get(id);
    if (!u) fields[`pieceIds.${i}`] = ['No such appliance piece.'];
    else if (u.performerId !== input.performerId) fields[`pieceIds.${i}`] = ['This piece was made for another performer.'];
    else if (u.productionId !== input.productionId) fields[`pieceIds.${i}`] = ['This piece was made for another production.'];
  });
  if (Object.keys(fields).length) throw invalid(fields);
  const productIds = [...new Set([...(kit?.productIds ?? []), ...input.productIds])];
  const materials = new Map<string, { productId: string; pieceIds: string[] }>();
  for (const u of uses) {
    for (const m of u.materials) {
      const entry = materials.get(m.formulationId) ?? materials.set(m.formulationId, { productId: m.productId, pieceIds: [] }).get(m.formulationId)!;
      for (const p of u.pieceIds) if (!entry.pieceIds.includes(p)) entry.pieceIds.push(p);
    }
  }
  if (productIds.length === 0 && materials.size === 0) throw invalid({ productIds: ['Choose at least one product, a kit or an appliance piece.'] });
  return { productIds, materials };
}

/** Clears the planned products for the performer, in the order chosen, the appliance materials after. */
export async function answersFor(db: Db, performerId: string, planned: PlannedProducts, now: Date): Promise<CheckItem[]> {
  const results = await clearancesFor(db, { performerId, productIds: planned.productIds, formulationIds: [...planned.materials.keys()], now });
  const byFormulation = new Map(results.map((r) => [r.formulationId, r]));
  const byProduct = new Map(results.map((r) => [r.productId, r]));
  const items: CheckItem[] = [];
  const seen = new Set<string>();
  for (const id of planned.productIds) {
    const r = byProduct.get(id);
    if (r && !seen.has(r.formulationId)) {
      seen.add(r.formulationId);
      items.push(itemOf(r, planned.materials.get(r.formulationId)?.pieceIds ?? []));
    }
  }
  for (const [formulationId, m] of planned.materials) {
    const r = byFormulation.get(formulationId);
    if (r && !seen.has(formulationId)) {
      seen.add(formulationId);
      items.push(itemOf(r, m.pieceIds));
    }
  }
  return items;
}

/**
 * The artist's check: one request, a fixed number of queries however many products. The answer is kept
 * (states and reasons only) so the application logged from it carries what the artist saw.
 */
export async function runCheck(ctx: AppContext, actor: Actor, raw: RunCheckInput, req: Request): Promise<Check> {
  const input = { ...raw, productIds: raw.productIds ?? [], pieceIds: raw.pieceIds ?? [] };
  authorize(actor, 'clearance.check', { productionId: input.productionId });
  const performer = await findPerformerForCheck(ctx.db, input.performerId, input.productionId);
  if (!performer) throw notFound('That performer');
  if (!performer.engaged) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const planned = await plannedProducts(ctx.db, input);
  const now = new Date();
  const items = await answersFor(ctx.db, input.performerId, planned, now);
  const formulationIds = items.map((i) => i.formulationId);
  const [approved, lots] = await Promise.all([approvedFormulations(ctx.db, input.productionId, input.performerId, formulationIds), usableLots(ctx.db, formulationIds, now)]);
  const id = await ctx.db.transaction().execute(async (trx) => {
    const checkId = await insertCheck(trx, { productionId: input.productionId, performerId: input.performerId, kitId: input.kitId ?? null, userId: actor.userId, items, pieceIds: input.pieceIds, runAt: now });
    const states = Object.fromEntries(items.map((i) => [i.formulationId, i.state]));
    await writeAudit(trx, { actorUserId: actor.userId, action: 'check.run', entityType: 'clearance_check', entityId: checkId, productionId: input.productionId, performerId: input.performerId, req, details: { products: items.length, states } });
    return checkId;
  });
  const row: CheckRow = { id, productionId: input.productionId, performerId: input.performerId, performerName: performer.name, kitId: input.kitId ?? null, runAt: now, runByName: null, items, pieceIds: input.pieceIds, applicationId: null };
  return view(actor, row, approved, [], lots);
}

/** A check as it stands: its kept answers, with the lead's answers to its requests as they come. */
export async function checkById(ctx: AppContext, actor: Actor, id: string): Promise<Check> {
  const c = await findCheck(ctx.db, id);
  if (!c) throw notFound('That check');
  authorize(actor, 'clearance.check', { productionId: c.productionId });
  const formulationIds = c.items.map((i) => i.formulationId);
  const [approved, requests, lots] = await Promise.all([approvedFormulations(ctx.db, c.productionId, c.performerId, formulationIds), listRequestsOfCheck(ctx.db, id), usableLots(ctx.db, formulationIds, new Date())]);
  return view(actor, c, approved, requests, lots);
}
