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
  | 'catalogue.read'
  | 'catalogue.manage'
  | 'protocols.manage'
  | 'patchtests.book'
  | 'clearance.check'
  | 'applications.log'
  | 'reactions.report'
  | 'casts.manage'
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
  'catalogue.read',
  'catalogue.manage',
  'protocols.manage',
  'patchtests.book',
  'clearance.check',
]);
const LEAD_ACTIONS: ReadonlySet<Action> = new Set<Action>([...HEAD_ACTIONS, 'medical.read', 'medical.write']);
const ARTIST_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  'production.view',
  'performers.view',
  'catalogue.read',
  'clearance.check',
  'applications.log',
  'reactions.report',
]);
const ARCHIVIST_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view', 'performers.view', 'catalogue.read', 'casts.manage']);
const PERFORMER_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view']);

const ADMIN_ONLY: ReadonlySet<Action> = new Set<Action>([
  'users.manage',
  'productions.manage',
  'memberships.manage',
  'lead.appoint',
  'audit.read',
  'outbox.read',
]);

/**
 * The product catalogue (ingredients, products, lots, safety data sheets) and the test protocols are
 * the department's shared stock, used by every production: a role that grants one of these anywhere
 * grants it studio-wide, and the resource named does not matter.
 */
const STUDIO_WIDE: ReadonlySet<Action> = new Set<Action>(['catalogue.read', 'catalogue.manage', 'protocols.manage']);

/** The administrator reads the catalogue (names only, nothing medical) but leaves its upkeep to heads and leads. */
const ADMIN_READS: ReadonlySet<Action> = new Set<Action>(['catalogue.read']);

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
 * May this actor do this action on this resource? Studio-wide actions need the admin flag;
 * production actions need a role on the resource's production (or, for a studio-wide
 * performer record, on any production the performer is engaged on). Medical data is open
 * only to the designated lead of such a production and to the performer themself.
 */
export function can(actor: Actor, action: Action, resource: Resource = {}): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  // Consent templates are studio-wide: kept by administrators and by any head or lead.
  if (action === 'templates.manage') return actor.isAdmin || canSomewhere(actor, 'consents.manage');
  if (STUDIO_WIDE.has(action)) return canSomewhere(actor, action);

  const isSelf = resource.performerId != null && actor.performerIds.includes(resource.performerId);
  if (action === 'performer.self') return isSelf;
  if (action === 'medical.read' && isSelf) return true;

  const productions = productionsOf(resource);
  return productions.some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}

/** Does any of this actor's roles grant the action somewhere? For navigation, and for the studio-wide actions above. */
export function canSomewhere(actor: Actor, action: Action): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  if (action === 'templates.manage') return actor.isAdmin || canSomewhere(actor, 'consents.manage');
  if (ADMIN_READS.has(action) && actor.isAdmin) return true;
  if (action === 'performer.self' || action === 'medical.read') {
    if (actor.performerIds.length > 0) return true;
  }
  const all = new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf]);
  return [...all].some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}
