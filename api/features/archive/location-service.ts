import type { Request } from 'express';
import {
  breadcrumb,
  descendantIds,
  fullCodePath,
  locationPath,
  locationCodeRefusal,
  locationDeletionRefusal,
  normaliseLocationCode,
  parentLevelRefusal,
  reparentRefusal,
  siblingCodeClash,
} from '#shared/domain/archive-locations.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { CreateLocationInput, Location, LocationTree, UpdateLocationInput } from '#shared/schemas/archive.ts';
import type { FieldErrors } from '#shared/errors.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { castScope, toListItem } from './cast-view.ts';
import { newLabelCode } from './labels.ts';
import { countCastsByLocation, listCastsAt } from './repo-casts.ts';
import {
  deleteLocationAtVersion,
  findLocation,
  insertLocation,
  listLocations,
  lockLocation,
  lockTree,
  locationContents,
  updateLocationAtVersion,
  type LocationRecord,
} from './repo-locations.ts';

const staleLocation = (version: number) => conflict('Someone else changed this place since you opened it. Reload to see their change.', { currentVersion: version });

function present(l: LocationRecord, tree: readonly LocationRecord[], counts: Map<string, number>): Location {
  const below = [...descendantIds(l.id, tree)].reduce((n, id) => n + (counts.get(id) ?? 0), 0);
  const here = counts.get(l.id) ?? 0;
  return {
    id: l.id,
    parentId: l.parentId,
    level: l.level,
    code: l.code,
    name: l.name,
    environment: l.environment,
    labelCode: l.labelCode,
    path: fullCodePath(l.id, tree),
    breadcrumb: breadcrumb(l.id, tree),
    castsHere: here,
    castsBelow: here + below,
    version: l.version,
  };
}

/** The whole store, in code-path order, with how many of the casts the actor may see sit in each place. */
export async function locationTree(db: Db, actor: Actor): Promise<LocationTree> {
  const [tree, counts] = await Promise.all([listLocations(db), countCastsByLocation(db, castScope(actor, 'casts.read'))]);
  const items = tree.map((l) => present(l, tree, counts)).sort((a, b) => a.path.localeCompare(b.path, 'en', { numeric: true }));
  return { items, canManage: can(actor, 'locations.manage') };
}

/** One place: where it sits, what it holds (places, and the casts the actor may see, here and below), and what should be here but is out. */
export async function locationDetail(db: Db, actor: Actor, id: string, now = new Date()) {
  const [tree, counts] = await Promise.all([listLocations(db), countCastsByLocation(db, castScope(actor, 'casts.read'))]);
  const location = tree.find((l) => l.id === id);
  if (!location) throw notFound('That place');
  const scope = castScope(actor, 'casts.read');
  const below = [id, ...descendantIds(id, tree)];
  const [here, homed] = await Promise.all([listCastsAt(db, scope, below, 'current'), listCastsAt(db, scope, [id], 'normal')]);
  return {
    ...present(location, tree, counts),
    ancestors: locationPath(id, tree)
      .slice(0, -1)
      .map((node) => present(tree.find((l) => l.id === node.id)!, tree, counts)),
    children: tree.filter((l) => l.parentId === id).map((l) => present(l, tree, counts)).sort((a, b) => a.code.localeCompare(b.code, 'en', { numeric: true })),
    casts: here.map((c) => toListItem(c, tree, now)),
    away: homed.filter((c) => c.currentLocationId !== id).map((c) => toListItem(c, tree, now)),
    canManage: can(actor, 'locations.manage'),
  };
}

function fieldRefusals(tree: readonly LocationRecord[], v: { code: string; parentId: string | null }, selfId?: string): FieldErrors {
  const errors: FieldErrors = {};
  const code = normaliseLocationCode(v.code);
  const codeMessage = locationCodeRefusal(code);
  if (codeMessage) errors.code = [codeMessage];
  else {
    const clash = siblingCodeClash(code, v.parentId, tree, selfId);
    if (clash) errors.code = [`${clash.name} already has the code ${code} here; choose another.`];
  }
  return errors;
}

/** Adds a place to the store, under a parent of the level its own level needs. */
export async function createLocation(db: Db, actor: Actor, input: CreateLocationInput, req: Request): Promise<string> {
  return db.transaction().execute(async (trx) => {
    await lockTree(trx);
    const tree = await listLocations(trx);
    const parent = input.parentId ? tree.find((l) => l.id === input.parentId) : null;
    if (input.parentId && !parent) throw invalid({ parentId: ['That place was not found.'] });
    const errors = fieldRefusals(tree, input);
    const levelMessage = parentLevelRefusal(input.level, parent?.level ?? null);
    if (levelMessage) errors.parentId = [levelMessage];
    if (Object.keys(errors).length) throw invalid(errors);
    const code = normaliseLocationCode(input.code);
    const id = await insertLocation(trx, { parentId: input.parentId, level: input.level, code, name: input.name, environment: input.environment, labelCode: await newLabelCode(trx, 'location') });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'location.create', entityType: 'archive_location', entityId: id, req, details: { level: input.level, path: parent ? `${fullCodePath(parent.id, tree)}/${code}` : code } });
    return id;
  });
}

/** Renames, re-codes or moves a place within the tree; the tree stays a tree. */
export async function updateLocation(db: Db, actor: Actor, id: string, input: UpdateLocationInput, req: Request): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await lockTree(trx);
    const current = await lockLocation(trx, id);
    if (!current) throw notFound('That place');
    if (current.version !== input.version) throw staleLocation(current.version);
    const tree = await listLocations(trx);
    const parent = input.parentId ? tree.find((l) => l.id === input.parentId) : null;
    if (input.parentId && !parent) throw invalid({ parentId: ['That place was not found.'] });
    const errors = fieldRefusals(tree, input, id);
    const treeErrors = reparentRefusal(current, parent ?? null, new Map(tree.map((l) => [l.id, l.parentId])));
    if (treeErrors) Object.assign(errors, treeErrors);
    if (Object.keys(errors).length) throw invalid(errors);
    const code = normaliseLocationCode(input.code);
    if (!(await updateLocationAtVersion(trx, id, { parentId: input.parentId, code, name: input.name, environment: input.environment }, input.version))) throw staleLocation(current.version);
    const changed = (['parentId', 'code', 'name', 'environment'] as const).filter((k) => (k === 'code' ? code : input[k]) !== current[k]);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'location.update', entityType: 'archive_location', entityId: id, req, details: { fields: changed, pathBefore: fullCodePath(id, tree) } });
  });
}

/** Removes an empty place: nothing inside it, no cast in it, no cast calling it home. */
export async function deleteLocation(db: Db, actor: Actor, id: string, version: number, req: Request): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await lockTree(trx);
    const current = await lockLocation(trx, id);
    if (!current) throw notFound('That place');
    if (current.version !== version) throw staleLocation(current.version);
    const refusal = locationDeletionRefusal(await locationContents(trx, id));
    if (refusal) throw conflict(refusal);
    const tree = await listLocations(trx);
    const path = fullCodePath(id, tree);
    if (!(await deleteLocationAtVersion(trx, id, version))) throw staleLocation(current.version);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'location.delete', entityType: 'archive_location', entityId: id, req, details: { path, name: current.name } });
  });
}

export { findLocation };
