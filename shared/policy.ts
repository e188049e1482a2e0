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

/** Every permission Plinth decides, named `subject.verb`. */
export const ACTIONS = [
  'users.manage',
  'productions.manage',
  'memberships.manage',
  'lead.appoint',
  'audit.read',
  'audit.review',
  'outbox.read',
  'production.view',
  'performers.view',
  'performers.manage',
  'consents.manage',
  'consents.request',
  'medical.read',
  'medical.write',
  'catalogue.read',
  'catalogue.manage',
  'protocols.manage',
  'patchtests.book',
  'patchtests.read',
  'patchtests.record',
  'clearance.check',
  'clearance.override',
  'applications.log',
  'reactions.report',
  'casts.read',
  'casts.manage',
  'archive.view',
  'locations.manage',
  'performer.self',
  'performer.view',
  'templates.manage',
  'templates.read',
  'sessions.view',
  'sessions.book',
  'consents.view',
  'consents.withdraw',
  'consents.verify',
  'accounts.unlink',
  'accounts.invite',
  'builds.read',
  'builds.manage',
  'builds.plan',
  'kits.manage',
  'applications.read',
  'lots.trace',
] as const;
export type Action = (typeof ACTIONS)[number];

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
  'consents.view',
  'performer.view',
  'catalogue.read',
  'catalogue.manage',
  'protocols.manage',
  'patchtests.book',
  'patchtests.read',
  'clearance.check',
  'casts.read',
  'sessions.view',
  'sessions.book',
  'accounts.unlink',
  'accounts.invite',
  'builds.read',
  'builds.manage',
  'builds.plan',
  'kits.manage',
  'applications.read',
  'lots.trace',
]);
/**
 * The head's workshop decisions that the lead appointment does not carry: the lead reads appliance
 * builds, and makes or plans them only through a head or artist role of their own.
 */
const HEAD_WORKSHOP_ACTIONS: ReadonlySet<Action> = new Set<Action>(['builds.manage', 'builds.plan', 'kits.manage']);
// The lead alone among staff may withdraw a consent on the performer's behalf (and read what it holds).
const LEAD_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  ...[...HEAD_ACTIONS].filter((a) => !HEAD_WORKSHOP_ACTIONS.has(a)),
  'medical.read',
  'medical.write',
  'consents.withdraw',
  // Applying, reading and closing a test, and overriding a clearance, are the lead's alone.
  'patchtests.record',
  'clearance.override',
  // The lead answers for who touched the production's health records, so reads its part of the audit log.
  'audit.review',
]);
const ARTIST_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  'production.view',
  'performers.view',
  'performer.view',
  'consents.view',
  'sessions.view',
  'catalogue.read',
  'patchtests.read',
  'clearance.check',
  'applications.log',
  'reactions.report',
  'casts.read',
  'builds.read',
  'builds.manage',
  'kits.manage',
  'applications.read',
]);
const ARCHIVIST_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view', 'performers.view', 'performer.view', 'consents.view', 'sessions.view', 'catalogue.read', 'patchtests.read', 'casts.read', 'casts.manage', 'builds.read']);
const PERFORMER_ACTIONS: ReadonlySet<Action> = new Set<Action>(['production.view']);
/** What the performer may do with their own record, whatever production it is viewed through. */
const SELF_ACTIONS: ReadonlySet<Action> = new Set<Action>(['performer.self', 'performer.view', 'medical.read', 'consents.view', 'consents.withdraw', 'patchtests.read']);

/** Production actions the studio administrator holds on every production without a role there. */
const ADMIN_EVERYWHERE: ReadonlySet<Action> = new Set<Action>(['audit.review']);

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
 * May this actor do this action on this resource? Studio-wide actions need the admin flag;
 * production actions need a role on the resource's production (or, for a studio-wide
 * performer record, on any production the performer is engaged on). Medical data is open
 * only to the designated lead of such a production and to the performer themself.
 */
export function can(actor: Actor, action: Action, resource: Resource = {}): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  if (ADMIN_EVERYWHERE.has(action) && actor.isAdmin) return true;
  const studioWide = STUDIO_WIDE[action];
  if (studioWide) return studioWide(actor);

  const isSelf = resource.performerId != null && actor.performerIds.includes(resource.performerId);
  if (SELF_ACTIONS.has(action) && isSelf) return true;
  if (action === 'performer.self') return false;
  // Linking changes belong to whoever manages the performer, and to the administrator who keeps sign-ins.
  if ((action === 'accounts.unlink' || action === 'accounts.invite') && actor.isAdmin && resource.performerId != null) return true;

  const productions = productionsOf(resource);
  return productions.some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}

/**
 * Actions on studio-wide things (the consent forms every production uses, the PDF checker): they
 * hold no production, so the answer is whether any of the actor's roles grants the matching
 * production action. Decided here, once; data routes ask can() like any other action.
 */
const STUDIO_WIDE: Partial<Record<Action, (actor: Actor) => boolean>> = {
  'templates.manage': (actor) => actor.isAdmin || roleGrantsSomewhere(actor, 'consents.manage'),
  'templates.read': (actor) => actor.isAdmin || roleGrantsSomewhere(actor, 'consents.request'),
  'consents.verify': (actor) => actor.isAdmin || roleGrantsSomewhere(actor, 'performers.view'),
  // One department's stock serves every production: staff read it; heads and leads keep it; the administrator reads it.
  'catalogue.read': (actor) => actor.isAdmin || roleGrantsSomewhere(actor, 'catalogue.read'),
  'catalogue.manage': (actor) => roleGrantsSomewhere(actor, 'catalogue.manage'),
  'protocols.manage': (actor) => roleGrantsSomewhere(actor, 'protocols.manage'),
  // One store keeps every production's casts: its places are kept by whoever is an archivist
  // somewhere, and Find opens for whoever may read a cast somewhere; each cast is still checked
  // against its own production and performer.
  'archive.view': (actor) => roleGrantsSomewhere(actor, 'casts.read'),
  'locations.manage': (actor) => roleGrantsSomewhere(actor, 'casts.manage'),
};

/** Whether a role the actor holds on some production grants the action there. */
function roleGrantsSomewhere(actor: Actor, action: Action): boolean {
  const all = new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf]);
  return [...all].some((p) => rolesOn(actor, p).some((r) => actionsOfRole(r).has(action)));
}

/** Does any of this actor's roles grant the action somewhere? Only for showing navigation, never for data. */
export function canSomewhere(actor: Actor, action: Action): boolean {
  if (ADMIN_ONLY.has(action)) return actor.isAdmin;
  if (ADMIN_EVERYWHERE.has(action) && actor.isAdmin) return true;
  const studioWide = STUDIO_WIDE[action];
  if (studioWide) return studioWide(actor);
  if (SELF_ACTIONS.has(action) && actor.performerIds.length > 0) return true;
  return roleGrantsSomewhere(actor, action);
}
