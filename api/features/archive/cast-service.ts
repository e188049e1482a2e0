import type { Request } from 'express';
import { pouredFromRefusal, conditionCheckRefusal } from '#shared/domain/archive-casts.ts';
import { breadcrumb, fullCodePath, type LocationSet } from '#shared/domain/archive-locations.ts';
import { initialCastState, MOVEMENT_KINDS, movementAllowed } from '#shared/domain/archive-movements.ts';
import { labelUrl } from '#shared/domain/label-codes.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { CastDetail, ConditionCheckInput, CreateCastInput, People, PerformerCasts, UpdateCastInput } from '#shared/schemas/archive.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, forbidden, invalid, notFound } from '../../http/errors.ts';
import { engagedProductionIds, findPerformer } from '../performers/index.ts';
import { findProduction, staffOf } from '../productions/index.ts';
import { castResource, castScope, loadCastFor, photoUrl, placeOf, placeText, toListItem } from './cast-view.ts';
import { newLabelCode } from './labels.ts';
import { findCast, insertCast, listCastsOfPerformer, listPouredFrom, lockCast, updateCastAtVersion, type CastRecord } from './repo-casts.ts';
import { insertConditionCheck, listConditionChecks, listMovements, listPhotos, type PhotoRow } from './repo-history.ts';
import { listLocations } from './repo-locations.ts';
import { retentionOf, retentionView } from './retention.ts';

const staleCast = (version: number) => conflict('Someone else changed this cast since you opened it. Reload to see their change.', { currentVersion: version });

function placeRef(id: string | null, tree: LocationSet) {
  if (!id) return null;
  const path = fullCodePath(id, tree);
  return path ? { id, path, breadcrumb: breadcrumb(id, tree) } : null;
}

function related(c: CastRecord) {
  return { id: c.id, labelCode: c.labelCode, kind: c.kind, region: c.region, status: c.status };
}

function photoView(castId: string, p: PhotoRow) {
  return {
    id: p.id,
    url: photoUrl(castId, p.id, p.fileId, 'photo'),
    thumbnailUrl: photoUrl(castId, p.id, p.thumbFileId, 'thumbnail'),
    width: p.width,
    height: p.height,
    conditionCheckId: p.conditionCheckId,
    createdAt: p.createdAt.toISOString(),
  };
}

/** Everything a member of staff may see of one cast: where it is and has been, its condition, photos and retention. */
export async function castDetail(ctx: AppContext, actor: Actor, id: string, now = new Date()): Promise<CastDetail> {
  const { cast, canManage } = await loadCastFor(ctx.db, actor, id);
  const [tree, movements, checks, photos, source, poured, retention] = await Promise.all([
    listLocations(ctx.db),
    listMovements(ctx.db, id),
    listConditionChecks(ctx.db, id),
    listPhotos(ctx.db, id),
    cast.pouredFromId ? findCast(ctx.db, cast.pouredFromId) : Promise.resolve(undefined),
    listPouredFrom(ctx.db, id),
    retentionOf(ctx.db, [cast], now),
  ]);
  const place = placeOf(cast);
  return {
    ...toListItem(cast, tree, now),
    madeBy: cast.madeBy,
    notes: cast.notes,
    pouredFrom: source ? related(source) : null,
    pouredInto: poured.map(related),
    normalLocation: placeRef(cast.normalLocationId, tree),
    currentLocation: placeRef(cast.currentLocationId, tree),
    holder: place.kind === 'person' ? { name: place.holder, userId: cast.currentHolderUserId } : null,
    loanedTo: place.kind === 'production' ? place.production : null,
    since: cast.since.toISOString(),
    retention: retentionView(retention.get(id)!),
    movements: movements
      .toReversed()
      .map((m) => ({ id: m.id, kind: m.kind, at: m.at.toISOString(), movedBy: m.movedBy, authorisedBy: m.authorisedBy, from: m.fromLabel, to: m.toLabel, reason: m.reason, dueBackAt: m.dueBackAt?.toISOString() ?? null, witness: m.witness, method: m.method, contact: m.contact, note: m.note })),
    conditionChecks: checks.map((k) => ({ ...k, photos: photos.filter((p) => p.conditionCheckId === k.id).map((p) => photoView(id, p)) })),
    photos: photos.filter((p) => p.conditionCheckId === null).map((p) => photoView(id, p)),
    allowedMovements: canManage ? MOVEMENT_KINDS.filter((k) => movementAllowed(k, cast.status)) : [],
    canManage,
    labelUrl: labelUrl(ctx.config.appOrigin, cast.labelCode),
    version: cast.version,
  };
}

async function checkSource(db: Db, self: { id: string; kind: CastRecord['kind']; performerId: string }, sourceId: string | null): Promise<void> {
  if (!sourceId) return;
  const source = await findCast(db, sourceId);
  if (!source) throw invalid({ pouredFromId: ['That mold was not found.'] });
  const refusal = pouredFromRefusal({ id: self.id, kind: self.kind, performerKey: self.performerId }, { id: source.id, kind: source.kind, performerKey: source.performerId });
  if (refusal) throw invalid({ pouredFromId: [refusal] });
}

/** Records a new cast on its shelf or bin, which becomes its normal home; it gets its own label code. */
export async function createCast(db: Db, actor: Actor, input: CreateCastInput, req: Request): Promise<string> {
  const performer = await findPerformer(db, input.performerId);
  if (!performer) throw invalid({ performerId: ['That performer was not found.'] });
  if (!(await findProduction(db, input.productionId))) throw invalid({ productionId: ['That production was not found.'] });
  // Permission checked here: an archivist of the cast's production or of one the performer is engaged on.
  const resource = await castResource(db, input);
  if (!can(actor, 'casts.manage', { productionId: resource.productionId, performerProductionIds: resource.performerProductionIds })) throw forbidden('record casts of this performer');
  return db.transaction().execute(async (trx) => {
    const tree = await listLocations(trx);
    const place = tree.find((l) => l.id === input.locationId);
    if (!place) throw invalid({ locationId: ['That place was not found.'] });
    const since = new Date();
    const start = initialCastState(place, since);
    if (!start.ok) throw invalid(start.errors);
    await checkSource(trx, { id: '', kind: input.kind, performerId: input.performerId }, input.pouredFromId);
    const labelCode = await newLabelCode(trx, 'cast');
    const id = await insertCast(trx, { ...input, labelCode, since, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'cast.create', entityType: 'cast', entityId: id, productionId: input.productionId, req, details: { labelCode, performerId: input.performerId, place: fullCodePath(place.id, tree) } });
    return id;
  });
}

/** Corrects what a cast is (region, kind, material, maker, source, notes); where it is changes only by movements. */
export async function updateCast(db: Db, actor: Actor, id: string, input: UpdateCastInput, req: Request): Promise<void> {
  await loadCastFor(db, actor, id, 'casts.manage');
  await db.transaction().execute(async (trx) => {
    const current = await lockCast(trx, id);
    if (!current) throw notFound('That cast');
    if (current.version !== input.version) throw staleCast(current.version);
    await checkSource(trx, { id, kind: input.kind, performerId: current.performerId }, input.pouredFromId);
    // Casts poured from this one stay valid only while it is still a mold.
    if (input.kind !== 'mold' && (await listPouredFrom(trx, id)).length > 0) throw invalid({ kind: ['Casts were poured from this mold; it stays a mold.'] });
    if (!(await updateCastAtVersion(trx, id, input, input.version))) throw staleCast(current.version);
    const fields = (['region', 'kind', 'material', 'madeOn', 'madeBy', 'pouredFromId', 'notes'] as const).filter((k) => input[k] !== current[k]);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'cast.update', entityType: 'cast', entityId: id, productionId: current.productionId, req, details: { fields } });
  });
}

/** Records a look at the cast; the newest check is its condition. */
export async function recordConditionCheck(db: Db, actor: Actor, id: string, input: ConditionCheckInput, req: Request): Promise<string> {
  const { cast } = await loadCastFor(db, actor, id, 'casts.manage');
  const [y, m, d] = input.checkedOn.split('-').map(Number) as [number, number, number];
  // A calendar date is not in the future once that day has begun somewhere (UTC+14 is the earliest):
  // the day's start in UTC is compared with now plus fourteen hours.
  const refusal = conditionCheckRefusal({ ...input, checkedOn: new Date(Date.UTC(y, m - 1, d)) }, new Date(Date.now() + 14 * 3_600_000));
  if (refusal) throw invalid(refusal);
  return db.transaction().execute(async (trx) => {
    if (!(await lockCast(trx, id))) throw notFound('That cast');
    const checkId = await insertConditionCheck(trx, { castId: id, checkedOn: input.checkedOn, checkedBy: input.checkedBy, grade: input.grade, notes: input.notes, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'cast.condition_check', entityType: 'cast', entityId: id, productionId: cast.productionId, req, details: { grade: input.grade, checkedOn: input.checkedOn } });
    return checkId;
  });
}

/**
 * A performer's casts on their record: staff who may see casts of the performer's productions get
 * the archive's lines; the performer sees their own, and where each is kept, in plain words.
 */
export async function performerCasts(db: Db, actor: Actor, performerId: string, now = new Date()): Promise<PerformerCasts> {
  const performer = await findPerformer(db, performerId);
  if (!performer) throw notFound('That performer');
  const productionIds = await engagedProductionIds(db, performerId);
  const casts = await listCastsOfPerformer(db, performerId);
  const tree = await listLocations(db);
  if (actor.performerIds.includes(performerId)) {
    const retention = await retentionOf(db, casts, now);
    return {
      view: 'own',
      items: casts.map((c) => {
        const item = toListItem(c, tree, now);
        return {
          id: c.id,
          labelCode: c.labelCode,
          region: c.region,
          kind: c.kind,
          material: c.material,
          madeOn: c.madeOn,
          productionName: c.productionName,
          status: c.status,
          where: ownWhere(c, tree),
          retention: retentionView(retention.get(c.id)!),
          thumbnailUrl: item.thumbnailUrl,
        };
      }),
    };
  }
  const visible = casts.filter((c) => can(actor, 'casts.read', { productionId: c.productionId, performerProductionIds: productionIds }));
  if (visible.length === 0 && !can(actor, 'casts.read', { performerProductionIds: productionIds })) throw forbidden('see this performer’s casts');
  return { view: 'staff', items: visible.map((c) => toListItem(c, tree, now)), canAdd: can(actor, 'casts.manage', { performerProductionIds: productionIds }) };
}

/** Where the performer's own cast is, without naming who in the department has it. */
export function ownWhere(c: CastRecord, tree: LocationSet): string {
  switch (c.status) {
    case 'in_store':
      return placeText(placeOf(c), tree);
    case 'checked_out':
      return 'Out of the store with the department, for work on the production';
    case 'on_loan':
      return `On loan to ${c.currentProduction ?? 'another production'}`;
    case 'returned_to_performer':
      return 'Returned to you';
    case 'destroyed':
      return 'Destroyed';
  }
}

/** Staff of the cast's productions, to name as the person taking it, authorising a move or witnessing. */
export async function castPeople(db: Db, actor: Actor, id: string): Promise<People> {
  const { resource } = await loadCastFor(db, actor, id, 'casts.manage');
  const staff = await staffOf(db, [...new Set([resource.productionId!, ...(resource.performerProductionIds ?? [])])]);
  return { items: staff.map((s) => ({ userId: s.userId, name: s.name })) };
}

export { castScope };
