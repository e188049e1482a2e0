import { currentPlaceLabel, type CurrentPlace } from '#shared/domain/archive-casts.ts';
import { breadcrumb, fullCodePath, type LocationSet } from '#shared/domain/archive-locations.ts';
import { isOverdue, type CastState } from '#shared/domain/archive-movements.ts';
import { can, type Actor, type Resource } from '#shared/policy.ts';
import type { CastListItem } from '#shared/schemas/archive.ts';
import type { Db } from '../../db/index.ts';
import { forbidden, notFound } from '../../http/errors.ts';
import { productionsWhere } from '../performers/index.ts';
import { engagedProductionIds } from '../performers/index.ts';
import { findCast, type CastRecord, type CastScope, type StoredWhereabouts } from './repo-casts.ts';

/** The casts an actor may read (casts.read) or manage (casts.manage), as a query scope. */
export function castScope(actor: Actor, action: 'casts.read' | 'casts.manage'): CastScope {
  return { productionIds: productionsWhere(actor, action) };
}

/** A cast is the business of its own production and of every production its performer is engaged on. */
export async function castResource(db: Db, cast: Pick<CastRecord, 'productionId' | 'performerId'>): Promise<Resource> {
  return { productionId: cast.productionId, performerId: cast.performerId, performerProductionIds: await engagedProductionIds(db, cast.performerId) };
}

/** Loads a cast for a staff member; 404 before 403. Permission checked here. */
export async function loadCastFor(db: Db, actor: Actor, id: string, action: 'casts.read' | 'casts.manage' = 'casts.read') {
  const cast = await findCast(db, id);
  if (!cast) throw notFound('That cast');
  const resource = await castResource(db, cast);
  // The performer's own casts reach them through their record (performerCasts), never as staff.
  const staff = { productionId: resource.productionId, performerProductionIds: resource.performerProductionIds };
  if (!can(actor, action, staff)) throw forbidden(action === 'casts.read' ? 'see this cast' : 'change this cast');
  return { cast, resource, canManage: can(actor, 'casts.manage', staff) };
}

/** The cast's one current place, read from the column its status names. */
export function placeOf(c: Pick<CastRecord, 'status' | 'currentLocationId' | 'currentHolder' | 'currentProduction'>): CurrentPlace {
  switch (c.status) {
    case 'in_store':
      return { kind: 'location', locationId: c.currentLocationId! };
    case 'checked_out':
      return { kind: 'person', holder: c.currentHolder ?? 'someone' };
    case 'on_loan':
      return { kind: 'production', production: c.currentProduction ?? 'another production' };
    case 'returned_to_performer':
      return { kind: 'performer' };
    case 'destroyed':
      return { kind: 'destroyed' };
  }
}

/** The archive's rules' view of where a stored cast is. */
export function stateOf(c: CastRecord): CastState {
  return { status: c.status, normalLocationId: c.normalLocationId, current: placeOf(c), dueBackAt: c.dueBackAt, since: c.since };
}

/** A state the rules produced, as the cast's columns hold it. */
export function whereaboutsOf(state: CastState, holderUserId: string | null): StoredWhereabouts {
  const p = state.current;
  return {
    status: state.status,
    normalLocationId: state.normalLocationId,
    currentLocationId: p.kind === 'location' ? p.locationId : null,
    currentHolder: p.kind === 'person' ? p.holder : null,
    currentHolderUserId: p.kind === 'person' ? holderUserId : null,
    currentProduction: p.kind === 'production' ? p.production : null,
    dueBackAt: state.dueBackAt,
    since: state.since ?? new Date(),
  };
}

/** A place in words: the breadcrumb and code path of a shelf or bin, or what the rules call it. */
export function placeText(place: CurrentPlace, tree: LocationSet): string {
  return currentPlaceLabel(place, (id) => {
    const crumb = breadcrumb(id, tree);
    return crumb ? `${crumb} (${fullCodePath(id, tree)})` : 'A place no longer in the store';
  });
}

export function photoUrl(castId: string, photoId: string, fileId: string, which: 'photo' | 'thumbnail'): string {
  return `/api/casts/${castId}/photos/${photoId}${which === 'thumbnail' ? '/thumbnail' : ''}?v=${fileId}`;
}

/** A cast as a line of a list. */
export function toListItem(c: CastRecord, tree: LocationSet, now: Date): CastListItem {
  return {
    id: c.id,
    labelCode: c.labelCode,
    performerId: c.performerId,
    performerName: c.performerName,
    productionId: c.productionId,
    productionName: c.productionName,
    region: c.region,
    kind: c.kind,
    material: c.material,
    madeOn: c.madeOn,
    status: c.status,
    where: placeText(placeOf(c), tree),
    currentLocationId: c.currentLocationId,
    currentPath: c.currentLocationId ? fullCodePath(c.currentLocationId, tree) || null : null,
    dueBackAt: c.dueBackAt?.toISOString() ?? null,
    overdue: isOverdue(c, now),
    condition: c.condition,
    thumbnailUrl: c.thumbnail ? photoUrl(c.id, c.thumbnail.photoId, c.thumbnail.fileId, 'thumbnail') : null,
  };
}
