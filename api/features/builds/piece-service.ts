import type { Request } from 'express';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import { piecesRemaining, piecesShortfall } from '#shared/domain/pieces.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { ApplianceOutlook, BuildDetail, MarkPieceValues, SetPlanValues } from '#shared/schemas/builds.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { findCastsByIds } from '../archive/index.ts';
import { findBuild, lockBuild } from './repo.ts';
import { findPiece, insertPlan, listPlans, listPlansWithTally, lockPlan, setPieceStatusAtVersion, tallyByMold, updatePlanAtVersion } from './repo-pieces.ts';
import { checkMold } from './rules.ts';
import { buildDetail } from './service.ts';
import { outlookView } from './view.ts';

type Task = Home['tasks'][number];

/** Marks one piece used (optionally with the application it was worn for), spoiled, or back on the shelf. */
export async function markPiece(ctx: AppContext, actor: Actor, pieceId: string, input: MarkPieceValues, req: Request): Promise<BuildDetail> {
  const piece = await findPiece(ctx.db, pieceId);
  if (!piece) throw notFound('That piece');
  const build = await findBuild(ctx.db, piece.buildId);
  if (!build) throw notFound('That piece');
  authorize(actor, 'builds.manage', { productionId: build.productionId });
  await ctx.db
    .transaction()
    .execute(async (trx) => {
      // The build's lock queues a mark behind a change to the count of pieces made.
      if (!(await lockBuild(trx, build.id))) throw notFound('That piece');
      const ok = await setPieceStatusAtVersion(trx, pieceId, { status: input.status, applicationId: input.applicationId, note: input.note, by: actor.userId }, input.version);
      if (!ok) {
        if (!(await findPiece(trx, pieceId))) throw notFound('That piece');
        throw conflict('Someone else marked this piece since you opened the build. Reload to see it.');
      }
      await writeAudit(trx, {
        actorUserId: actor.userId,
        action: 'piece.mark',
        performerId: build.performerId,
        entityType: 'appliance_piece',
        entityId: pieceId,
        productionId: build.productionId,
        req,
        details: { buildId: build.id, number: piece.number, from: piece.status, to: input.status, applicationId: input.applicationId },
      });
    })
    .catch((err: unknown) => {
      // The application a used piece names must be a logged one.
      const e = err as { code?: string; constraint?: string } | null;
      if (e?.code === '23503' && e.constraint === 'appliance_pieces_application_fkey') throw invalid({ applicationId: ['No such logged application.'] });
      throw err;
    });
  return buildDetail(ctx, actor, build.id);
}

/** Every appliance of a production with builds or a plan: pieces left across its builds against the shoot days. */
export async function outlooksOf(db: Db, productionId: string): Promise<ApplianceOutlook[]> {
  const [counts, plans] = await Promise.all([tallyByMold(db, productionId), listPlans(db, productionId)]);
  const molds = await findCastsByIds(db, [...new Set([...counts.keys(), ...plans.keys()])]);
  return sortOutlooks(molds.map((m) => outlookView(productionId, m, counts.get(m.id), plans.get(m.id))));
}

/** By performer, then by the mold's label code. */
function sortOutlooks(outlooks: ApplianceOutlook[]): ApplianceOutlook[] {
  return outlooks.toSorted((a, b) => a.performer.name.localeCompare(b.performer.name) || a.mold.labelCode.localeCompare(b.mold.labelCode));
}

export async function listOutlooks(ctx: AppContext, actor: Actor, productionId: string) {
  authorize(actor, 'builds.read', { productionId });
  return { items: await outlooksOf(ctx.db, productionId), canPlan: can(actor, 'builds.plan', { productionId }) };
}

/** Sets the shoot days still to come for one appliance (a mold's pieces on a production), and its spares. */
export async function setPlan(ctx: AppContext, actor: Actor, input: SetPlanValues, req: Request): Promise<ApplianceOutlook> {
  authorize(actor, 'builds.plan', { productionId: input.productionId });
  const mold = await checkMold(ctx.db, input.moldId, input.productionId);
  const values = { shootDaysPlanned: input.shootDaysPlanned, spares: input.spares, piecesPerDay: input.piecesPerDay, updatedBy: actor.userId };
  await ctx.db.transaction().execute(async (trx) => {
    const current = await lockPlan(trx, input.productionId, mold.id);
    const stale = () => conflict('Someone else planned this appliance since you opened it. Reload to see their plan.', { currentVersion: current?.version ?? null });
    if (current) {
      if (input.version !== current.version || !(await updatePlanAtVersion(trx, current.id, values, current.version))) throw stale();
    } else {
      if (input.version !== null) throw stale();
      await insertPlan(trx, input.productionId, mold.id, values);
    }
    await writeAudit(trx, {
      actorUserId: actor.userId,
      action: 'appliance_plan.set',
      performerId: mold.performerId,
      entityType: 'cast',
      entityId: mold.id,
      productionId: input.productionId,
      req,
      details: { shootDaysPlanned: input.shootDaysPlanned, spares: input.spares, piecesPerDay: input.piecesPerDay },
    });
  });
  const [counts, plans] = await Promise.all([tallyByMold(ctx.db, input.productionId, [mold.id]), listPlans(ctx.db, input.productionId, [mold.id])]);
  return outlookView(input.productionId, mold, counts.get(mold.id), plans.get(mold.id));
}

/** The head's warning: appliances whose pieces left will not cover the shoot days planned plus spares. */
export async function piecesShortTask(db: Db, productionId: string): Promise<Task> {
  // Only a planned appliance can fall short: its plan and tally in one statement, its mold read only when short.
  const planned = await listPlansWithTally(db, productionId);
  const shortIds = [...planned].filter(([, { plan, tally }]) => piecesShortfall(piecesRemaining(tally), plan.shootDaysPlanned, plan.spares, plan.piecesPerDay).short).map(([id]) => id);
  const molds = shortIds.length ? await findCastsByIds(db, shortIds) : [];
  const short = sortOutlooks(molds.map((m) => outlookView(productionId, m, planned.get(m.id)!.tally, planned.get(m.id)!.plan)));
  const line = (o: ApplianceOutlook) =>
    `${o.performer.name}’s ${BODY_REGION_LABELS[o.mold.region].toLowerCase()} (${o.mold.labelCode}): ${o.tally.remaining} left for ${o.shortfall!.needed} needed, short by ${o.shortfall!.shortBy}`;
  return {
    id: 'appliance-pieces-short',
    title: 'Appliance pieces running short',
    detail: short.length
      ? `${short.slice(0, 3).map(line).join('; ')}${short.length > 3 ? ` and ${short.length - 3} more` : ''}. Run more pieces before the shoot days planned.`
      : 'The pieces left cover the shoot days planned, spares included.',
    count: short.length,
    href: '/builds',
  };
}
