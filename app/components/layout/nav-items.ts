import type { Action } from '#shared/policy.ts';
import type { Session } from '#shared/schemas/session.ts';
import { seatCan } from '../../features/session/seat.ts';
import { paths } from '../../lib/paths.ts';

export interface NavItem {
  label: string;
  to: string;
  /** The policy action the acting seat needs to see this item; null for everyone. */
  action: Action | null;
  /** Match the path exactly (for "/", which every path starts with). */
  end?: boolean;
}

/** The main navigation. A new screen is one line here, keyed by the action that unlocks it. */
export const NAV_ITEMS: readonly NavItem[] = [
  { label: 'Home', to: paths.home.href(), action: null, end: true },
  { label: 'Users', to: paths.users.href(), action: 'users.manage' },
  { label: 'Productions', to: paths.productions.href(), action: 'productions.manage' },
  { label: 'Outbox', to: paths.outbox.href(), action: 'outbox.read' },
  { label: 'Audit log', to: paths.audit.href(), action: 'audit.read' },
];

export function navItemsFor(session: Session): NavItem[] {
  return NAV_ITEMS.filter((item) => item.action === null || seatCan(session, item.action));
}
