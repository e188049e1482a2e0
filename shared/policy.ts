/**
 * The one permission policy. The API calls `can()` on every route; the client calls the same
 * function only to hide controls a person cannot use.
 */

export const PRODUCTION_ROLES = ['head', 'artist', 'archivist', 'performer'] as const;
export type ProductionRole = (typeof PRODUCTION_ROLES)[number];

/** The role a person acts in on a production: a membership role, or the lead appointment. */
export type ActingRole = ProductionRole | 'lead' | 'admin';

export const ROLE_LABELS: Record<ActingRole, string> = {
  admin: 'Studio administrator',
  head: 'Department head',
  lead: 'Designated lead',
  artist: 'Artist',
  archivist: 'Archivist',
  performer: 'Performer',
};

export interface Actor {
  userId: string;
  isAdmin: boolean;
  memberships: readonly { productionId: string; role: ProductionRole }[];
  /** Productions on which this user is the designated lead right now. */
  leadOf: readonly string[];
  /** Performer records linked to this sign-in (usually zero or one). */
  performerIds: readonly string[];
}

export type Action =
  | 'users.manage'
  | 'productions.manage'
  | 'memberships.manage'
  | 'lead.appoint'
  | 'audit.read'
  | 'outbox.read'
  | 'production.view'
  | 'performers.view'
  | 'performers.manage'
  | 'consents.manage'
  | 'consents.request'
  | 'medical.read'
  | 'medical.write'
  | 'catalogue.manage'
  | 'patchtests.book'
  | 'clearance.check'
  | 'applications.log'
  | 'reactions.report'
  | 'casts.read'
  | 'casts.manage'
  | 'archive.view'
  | 'locations.manage'
  | 'performer.self'
  | 'templates.manage';

export interface Resource {
  productionId?: string | null;
  /** The performer the data belongs to, where it does. */
  performerId?: string | null;
  /** Productions the performer is engaged on, for studio-wide performer records. */
  performerProductionIds?: readonly string[];
}

const HEAD_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  'production.view',
  'performers.view',
  'performers.manage',
  'consents.manage',
  'consents.request',
  'catalogue.manage',
  'patchtests.book',
  'clearance.check',
  'casts.read',
]);
const LEAD_ACTIONS: ReadonlySet<Action> = new Set<Action>([...HEAD_ACTIONS, 'medical.read', 'medical.write']);
const ARTIST_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  'production.view',
  'performers.view',
  'clearance.check',
  'applications.log',
  'reactions.report',
  'casts.read',
]);
const ARCHIVIST_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view', 'performers.view', 'casts.read', 'casts.manage']);
const PERFORMER_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view']);

const ADMIN_ONLY: ReadonlySet<Action> = new Set<Action>([
  'users.manage',
  'productions.manage',
  'memberships.manage',
  'lead.appoint',
  'audit.read',
  'outbox.read',
]);

/** Actions a role grants on its own production. */
export function actionsOfRole(role: ActingRole): ReadonlySet<Action> {
  switch (role) {
    case 'admin':
      return ADMIN_ONLY;
    case 'head':
      return HEAD_ACTIONS;
    case 'lead':
      return LEAD_ACTIONS;
    case 'artist':
      return ARTIST_ACTIONS;
    case 'archivist':
      return ARCHIVIST_ACTIONS;
    case 'performer':
      return PERFORMER_ACTIONS;
  }
}

/** Roles this actor holds on a production, the lead appointment included. */
export function rolesOn(actor: Actor, productionId: string): ActingRole[] {
  const roles: ActingRole[] = actor.memberships.filter((m) => m.productionId === productionId).map((m) => m.role);
  if (actor.leadOf.includes(productionId)) roles.push('lead');
  return roles;
}

function productionsOf(resource: Resource): string[] {
  const ids = new Set<string>();
  if (resource.productionId) ids.add(resource.productionId);
  for (const id of resource.performerProductionIds ?? []) ids.add(id);
  return [...ids];
}

/**
 * The archive's studio-wide actions. One store keeps every production's casts, so its places are
 * kept by whoever is an archivist somewhere, and the Find screen opens for whoever may read a
 * cast somewhere; each cast is still checked against its own production and performer.
 */
const STUDIO_WIDE_FROM: Partial<Record<Action, Action>> = {
  'archive.view': 'casts.read',
  'locations.manage': 'casts.manage',
};

/**
 * May this actor do this action on this resource? Studio-wide actions need the admin flag;
 * production actions need a role on the resource's production (or, for a studio-wide
 * performer record, on any production the performer is engaged on). Medical data is open
 * only to the designated lead of such a production and to the performer themself.
 */
export function can(actor: Actor, action: Action, resource: Resource = {}): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  // Consent templates are studio-wide: kept by administrators and by any head or lead.
  if (action === 'templates.manage') return actor.isAdmin || canSomewhere(actor, 'consents.manage');
  const studioWide = STUDIO_WIDE_FROM[action];
  if (studioWide) return canSomewhere(actor, studioWide);

  const isSelf = resource.performerId != null && actor.performerIds.includes(resource.performerId);
  if (action === 'performer.self') return isSelf;
  if (action === 'medical.read' && isSelf) return true;

  const productions = productionsOf(resource);
  return productions.some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}

/** Does any of this actor's roles grant the action somewhere? Only for showing navigation, never for data. */
export function canSomewhere(actor: Actor, action: Action): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  if (action === 'templates.manage') return actor.isAdmin || canSomewhere(actor, 'consents.manage');
  const studioWide = STUDIO_WIDE_FROM[action];
  if (studioWide) return canSomewhere(actor, studioWide);
  if (action === 'performer.self' || action === 'medical.read') {
    if (actor.performerIds.length > 0) return true;
  }
  const all = new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf]);
  return [...all].some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}
