import { type Action, type Actor, can } from '#shared/policy.ts';

/** Productions on which this actor may do the action (from their memberships and lead appointments). */
export function productionsWhere(actor: Actor, action: Action): string[] {
  const ids = new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf]);
  return [...ids].filter((productionId) => can(actor, action, { productionId })).sort();
}

/** What one actor may do with and see of one performer record, decided once per request. */
export interface PerformerAccess {
  isSelf: boolean;
  /** performers.view on one of the performer's productions, or the performer themself. */
  canView: boolean;
  /** performers.manage on one of the performer's productions. */
  canManage: boolean;
  /** Contact details: those who manage the performer, and the performer. */
  canSeeContact: boolean;
  /** Which sign-in is linked: as contact details, plus the studio administrator who links accounts. */
  canSeeLinkedUser: boolean;
  canSeeMedical: boolean;
  /**
   * Engagements and bookings shown: the performer sees all of theirs; staff see those on
   * productions where they may view performers (a casting on another production is not theirs to know).
   */
  showsProduction(productionId: string): boolean;
  /** Productions among the performer's on which this actor manages performers. */
  managedProductionIds: string[];
}

export function performerAccess(actor: Actor, performerId: string, performerProductionIds: readonly string[]): PerformerAccess {
  const resource = { performerId, performerProductionIds };
  const isSelf = actor.performerIds.includes(performerId);
  const canManage = can(actor, 'performers.manage', resource);
  const canView = isSelf || can(actor, 'performers.view', resource);
  return {
    isSelf,
    canView,
    canManage,
    canSeeContact: isSelf || canManage,
    canSeeLinkedUser: isSelf || canManage || actor.isAdmin,
    canSeeMedical: can(actor, 'medical.read', resource),
    showsProduction: (productionId) => isSelf || can(actor, 'performers.view', { productionId }),
    managedProductionIds: performerProductionIds.filter((productionId) => can(actor, 'performers.manage', { productionId })),
  };
}
