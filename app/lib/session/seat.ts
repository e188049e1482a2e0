import { ROLE_LABELS, canSomewhere, type Action, type Actor } from '#shared/policy.ts';
import type { Session, SessionSeat } from '#shared/schemas/session.ts';

/** A stable string for a seat, used as the <option> value of the seat switcher. */
export function seatKey(seat: Pick<SessionSeat, 'productionId' | 'role'>): string {
  return `${seat.productionId ?? 'studio'}:${seat.role}`;
}

export function seatLabel(seat: SessionSeat): string {
  if (seat.role === 'admin' || !seat.productionId) return ROLE_LABELS[seat.role];
  return `${seat.productionName ?? 'Untitled production'} — ${ROLE_LABELS[seat.role]}`;
}

/**
 * The actor narrowed to the seat the person acts in now. The client shows only what this seat
 * may do, even when the same person holds other seats; the server still checks every request.
 */
export function seatActor(session: Session): Actor {
  const seat = session.current;
  // The person's own performer record belongs to the performer seat, not to their staff seats.
  const base = { userId: session.user.id, performerIds: seat?.role === 'performer' ? session.performerIds : [] };
  if (!seat) return { ...base, isAdmin: false, memberships: [], leadOf: [] };
  if (seat.role === 'admin') return { ...base, isAdmin: session.user.isAdmin, memberships: [], leadOf: [] };
  const productionId = seat.productionId ?? '';
  if (seat.role === 'lead') return { ...base, isAdmin: false, memberships: [], leadOf: [productionId] };
  return { ...base, isAdmin: false, memberships: [{ productionId, role: seat.role }], leadOf: [] };
}

/** May the acting seat do this? For showing navigation and controls only, never for data. */
export function seatCan(session: Session | undefined, action: Action): boolean {
  if (!session?.current) return false;
  return canSomewhere(seatActor(session), action);
}

/** May the acting seat do at least one of these? (A page several roles open, each for its own reason.) */
export function seatCanAny(session: Session | undefined, actions: Action | readonly Action[]): boolean {
  const list: readonly Action[] = typeof actions === 'string' ? [actions] : actions;
  return list.some((action) => seatCan(session, action));
}

/** A performer's page and their consents: staff who may view performers, and the performer themself. */
export const PERFORMER_PAGE_ACTIONS: readonly Action[] = ['performers.view', 'performer.self'];

/**
 * "Check a PDF": staff who see performers, and the studio administrator. Every administrator-only
 * action stands for the administrator flag in the policy; users.manage is the one asked here.
 */
export const VERIFY_ACTIONS: readonly Action[] = ['performers.view', 'users.manage'];
