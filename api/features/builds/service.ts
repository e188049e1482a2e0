import type { Request } from 'express';
import { piecesMadeRefusal, tallyOfPieces } from '#shared/domain/builds.ts';
import { coatingVolumes } from '#shared/domain/coating.ts';
import { mixForRun } from '#shared/domain/mix.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { BuildDetail, BuildListQuery, CreateBuildValues, MoldOption, PerformerBuilds, UpdateBuildValues } from '#shared/schemas/builds.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, forbidden, invalid, notFound } from '../../http/errors.ts';
import { listHeldMoldsFor } from '../archive/index.ts';
import { engagedProductionIds, findPerformer, productionsWhere } from '../performers/index.ts';
import { productionNames } from '../productions/index.ts';
import { checkBuildFields, checkMold, type CheckedMaterial } from './rules.ts';
import { findBuild, insertBuild, listBuilds, listBuildsOfPerformer, listMaterials, lockBuild, replaceMaterials, updateBuildAtVersion, type BuildRow, type BuildValues } from './repo.ts';
import { deletePieces, insertPieces, listPieces, listPlans, tallyByMold } from './repo-pieces.ts';
import { buildPhotoUrl, listItem, materialsView, moldRef, namesFor, outlookView, piecesView } from './view.ts';

const staleBuild = (version: number) => conflict('Someone else changed this build since you opened it. Reload to see their change.', { currentVersion: version });

function valuesOf(input: Omit<CreateBuildValues, 'productionId' | 'moldId' | 'materials' | 'piecesMade'>): BuildValues {
  const plan = mixForRun(input.mix);
  return {
    madeOn: input.madeOn,
    madeBy: input.madeBy,
    mix: input.mix,
    plan,
    weighed: input.weighed,
    coating: input.coating,
    coatingVolumes: input.coating ? coatingVolumes(input.coating, input.coating.targetMl) : null,
    cureMinutes: input.cureMinutes,
    notes: input.notes,
  };
}

function materialRows(materials: readonly CheckedMaterial[]) {
  return materials.map((m) => ({ role: m.role, productId: m.productId, lotId: m.lotId, formulationId: m.formulationId }));
}

/** A build with everything its page shows: materials, weigh-out, pieces, and its appliance's outlook. */
export async function buildDetail(ctx: AppContext, actor: Actor, id: string): Promise<BuildDetail> {
  const build = await findBuild(ctx.db, id);
  if (!build) throw notFound('That build');
  authorize(actor, 'builds.read', { productionId: build.productionId });
  return detailOf(ctx.db, actor, build);
}

async function detailOf(db: Db, actor: Actor, build: BuildRow): Promise<BuildDetail> {
  const [names, productions, counts, plans] = await Promise.all([
    namesFor(db, [build]),
    productionNames(db, [build.productionId]),
    tallyByMold(db, build.productionId, [build.moldId]),
    listPlans(db, build.productionId, [build.moldId]),
  ]);
  const mold = names.molds.get(build.moldId);
  if (!mold) throw notFound('The mold of this build');
  const resource = { productionId: build.productionId };
  return {
    ...listItem(build, names),
    productionName: productions.get(build.productionId) ?? '',
    materials: materialsView(names.materials.get(build.id) ?? [], names),
    mix: build.mix,
    plan: build.plan,
    weighed: build.weighed,
    coating: build.coating,
    coatingVolumes: build.coatingVolumes,
    cureMinutes: build.cureMinutes,
    notes: build.notes,
    pieces: piecesView(names.pieces.get(build.id) ?? []),
    outlook: outlookView(build.productionId, mold, counts.get(build.moldId), plans.get(build.moldId)),
    photo: build.photoFileId && build.photoThumbFileId ? { url: buildPhotoUrl(build.id, build.photoFileId, 'photo'), thumbnailUrl: buildPhotoUrl(build.id, build.photoThumbFileId, 'thumbnail') } : null,
    canManage: can(actor, 'builds.manage', resource),
    canPlan: can(actor, 'builds.plan', resource),
    createdAt: build.createdAt.toISOString(),
    updatedAt: build.updatedAt.toISOString(),
    version: build.version,
  };
}

export async function createBuild(ctx: AppContext, actor: Actor, input: CreateBuildValues, req: Request): Promise<BuildDetail> {
  authorize(actor, 'builds.manage', { productionId: input.productionId });
  const mold = await checkMold(ctx.db, input.moldId, input.productionId);
  const materials = await checkBuildFields(ctx.db, input, { now: new Date() });
  const values = valuesOf(input);
  const id = await ctx.db.transaction().execute(async (trx) => {
    const buildId = await insertBuild(trx, { ...values, productionId: input.productionId, performerId: mold.performerId, moldId: mold.id, createdBy: actor.userId });
    await replaceMaterials(trx, buildId, materialRows(materials));
    await insertPieces(trx, buildId, 1, input.piecesMade);
    await writeAudit(trx, {
      actorUserId: actor.userId,
      action: 'build.create',
      performerId: mold.performerId,
      entityType: 'appliance_build',
      entityId: buildId,
      productionId: input.productionId,
      req,
      details: { moldId: mold.id, piecesMade: input.piecesMade, lots: materials.map((m) => m.lotId) },
    });
    return buildId;
  });
  return buildDetail(ctx, actor, id);
}

/** Corrects a build: its fields, materials and the count of pieces made; its mold and production stay. */
export async function updateBuild(ctx: AppContext, actor: Actor, id: string, input: UpdateBuildValues, req: Request): Promise<BuildDetail> {
  const current = await findBuild(ctx.db, id);
  if (!current) throw notFound('That build');
  authorize(actor, 'builds.manage', { productionId: current.productionId });
  const listed = new Set(((await listMaterials(ctx.db, [id])).get(id) ?? []).map((m) => m.lotId));
  const materials = await checkBuildFields(ctx.db, input, { now: new Date(), listedLotIds: listed });
  const values = valuesOf(input);
  await ctx.db.transaction().execute(async (trx) => {
    const locked = await lockBuild(trx, id);
    if (!locked) throw notFound('That build');
    if (locked.version !== input.version) throw staleBuild(locked.version);
    const pieces = (await listPieces(trx, [id])).get(id) ?? [];
    const refusal = piecesMadeRefusal(input.piecesMade, tallyOfPieces(pieces));
    if (refusal) throw invalid({ piecesMade: [refusal] });
    if (input.piecesMade > pieces.length) {
      await insertPieces(trx, id, Math.max(0, ...pieces.map((p) => p.number)) + 1, input.piecesMade - pieces.length);
    } else if (input.piecesMade < pieces.length) {
      // Pieces on the shelf go, highest numbers first; used and spoiled pieces stay on record.
      const onHand = pieces.filter((p) => p.status === 'on_hand').toSorted((a, b) => b.number - a.number);
      await deletePieces(trx, onHand.slice(0, pieces.length - input.piecesMade).map((p) => p.id));
    }
    if (!(await updateBuildAtVersion(trx, id, values, input.version))) throw staleBuild(locked.version);
    await replaceMaterials(trx, id, materialRows(materials));
    await writeAudit(trx, {
      actorUserId: actor.userId,
      action: 'build.update',
      performerId: current.performerId,
      entityType: 'appliance_build',
      entityId: id,
      productionId: current.productionId,
      req,
      details: { piecesMade: input.piecesMade, lots: materials.map((m) => m.lotId) },
    });
  });
  return buildDetail(ctx, actor, id);
}

/** A page of a production's builds (optionally one performer's or one mold's). */
export async function listBuildsPage(ctx: AppContext, actor: Actor, query: BuildListQuery) {
  authorize(actor, 'builds.read', { productionId: query.productionId });
  const { rows, total } = await listBuilds(ctx.db, { productionIds: [query.productionId], performerId: query.performerId, moldId: query.moldId }, query);
  const names = await namesFor(ctx.db, rows);
  return { items: rows.map((b) => listItem(b, names)), total, page: query.page, pageSize: query.pageSize, canManage: can(actor, 'builds.manage', { productionId: query.productionId }) };
}

/** Molds a production may run pieces from, for the build form and the shoot plan. */
export async function moldOptions(ctx: AppContext, actor: Actor, productionId: string): Promise<{ items: MoldOption[] }> {
  authorize(actor, 'builds.read', { productionId });
  const molds = await listHeldMoldsFor(ctx.db, productionId);
  return { items: molds.map((m) => ({ ...moldRef(m), performerId: m.performerId, performerName: m.performerName, madeOn: m.madeOn, status: m.status })) };
}

/**
 * A performer's builds with their materials: all of them for the performer themself (what is glued
 * to their skin is theirs to know), and those of productions where staff read builds otherwise.
 */
export async function performerBuilds(ctx: AppContext, actor: Actor, performerId: string): Promise<PerformerBuilds> {
  const performer = await findPerformer(ctx.db, performerId);
  if (!performer) throw notFound('That performer');
  const engaged = await engagedProductionIds(ctx.db, performerId);
  const isSelf = can(actor, 'performer.self', { performerId, performerProductionIds: engaged });
  const readsBuilds = new Set(productionsWhere(actor, 'builds.read'));
  const readable = engaged.filter((p) => readsBuilds.has(p));
  if (!isSelf && readable.length === 0) throw forbidden('see appliance builds');
  const rows = await listBuildsOfPerformer(ctx.db, performerId, isSelf ? null : readable);
  const [names, productions] = await Promise.all([namesFor(ctx.db, rows), productionNames(ctx.db, [...new Set(rows.map((r) => r.productionId))])]);
  return {
    items: rows.map((b) => ({ ...listItem(b, names), productionName: productions.get(b.productionId) ?? '', materials: materialsView(names.materials.get(b.id) ?? [], names) })),
  };
}
