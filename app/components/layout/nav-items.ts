import type { Action } from '#shared/policy.ts';
import type { Session } from '#shared/schemas/session.ts';
import { VERIFY_ACTIONS, seatCanAny } from '../../lib/session/seat.ts';
import { paths } from '../../lib/paths.ts';

export interface NavItem {
  label: string;
  to: string;
  /** The policy action(s) the acting seat needs to see this item (any one of them); null for everyone. */
  action: Action | readonly Action[] | null;
  /** Match the path exactly (for "/", which every path starts with). */
  end?: boolean;
}

interface NavEntry extends Omit<NavItem, 'to'> {
  /** A fixed path, or one that depends on who is signed in (null: leave the item out). */
  to: string | ((session: Session) => string | null);
}

/** The main navigation. A new screen is one line here, keyed by the action that unlocks it. */
export const NAV_ITEMS: readonly NavEntry[] = [
  { label: 'Home', to: paths.home.href(), action: null, end: true },
  { label: 'Performers', to: paths.performers.href(), action: 'performers.view' },
  // A performer acts on their own record only: "My record" takes the place of the registry.
  {
    label: 'My record',
    to: (session) => (session.performerIds[0] ? paths.performer.href(session.performerIds[0]) : null),
    action: 'performer.self',
  },
  { label: 'Sessions', to: paths.bookings.href(), action: 'performers.view' },
  { label: 'Check', to: paths.check.href(), action: 'clearance.check' },
  { label: 'Kits', to: paths.kits.href(), action: 'clearance.check' },
  { label: 'Catalogue', to: paths.catalogue.href(), action: 'catalogue.read' },
  { label: 'Ingredients', to: paths.ingredients.href(), action: 'catalogue.read' },
  { label: 'Protocols', to: paths.protocols.href(), action: 'catalogue.read' },
  { label: 'Archive', to: paths.archive.href(), action: 'archive.view' },
  { label: 'Storage places', to: paths.places.href(), action: 'archive.view' },
  { label: 'Retention', to: paths.retention.href(), action: 'casts.manage' },
  { label: 'Builds', to: paths.builds.href(), action: 'builds.read' },
  { label: 'Calculators', to: paths.mixCalculator.href(), action: 'builds.read' },
  { label: 'Consent forms', to: paths.consentForms.href(), action: 'templates.manage' },
  { label: 'Check a PDF', to: paths.verify.href(), action: VERIFY_ACTIONS },
  { label: 'Users', to: paths.users.href(), action: 'users.manage' },
  { label: 'Productions', to: paths.productions.href(), action: 'productions.manage' },
  { label: 'Outbox', to: paths.outbox.href(), action: 'outbox.read' },
  // The administrator's whole log, or the designated lead's production's part of it.
  { label: 'Audit log', to: paths.audit.href(), action: 'audit.review' },
];

export function navItemsFor(session: Session): NavItem[] {
  const items: NavItem[] = [];
  for (const entry of NAV_ITEMS) {
    if (entry.action !== null && !seatCanAny(session, entry.action)) continue;
    const to = typeof entry.to === 'function' ? entry.to(session) : entry.to;
    if (to) items.push({ ...entry, to });
  }
  return items;
}
