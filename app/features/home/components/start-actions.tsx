import type { Action } from '#shared/policy.ts';
import type { Session } from '#shared/schemas/session.ts';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { paths } from '../../../lib/paths.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';

interface StartAction {
  label: string;
  to: (session: Session) => string | null;
  /** The seat must be able to do this for the action to show (the server decides again). */
  action: Action;
}

/** The one or two things each seat starts its day from, most used first. */
const START_ACTIONS: Record<string, readonly StartAction[]> = {
  admin: [
    { label: 'Give someone a role', to: () => paths.users.href(), action: 'users.manage' },
    { label: 'Productions and leads', to: () => paths.productions.href(), action: 'productions.manage' },
  ],
  head: [
    { label: 'Register a performer', to: () => paths.newPerformer.href(), action: 'performers.manage' },
    { label: 'Sessions', to: () => paths.bookings.href(), action: 'sessions.view' },
  ],
  lead: [
    { label: 'Performers', to: () => paths.performers.href(), action: 'performers.view' },
    { label: 'Sessions', to: () => paths.bookings.href(), action: 'sessions.view' },
  ],
  // Nothing to do still starts from the check: it comes before anything touches the skin.
  artist: [
    { label: 'Run a check', to: () => paths.check.href(), action: 'clearance.check' },
    { label: 'Find a performer', to: () => paths.performers.href(), action: 'performers.view' },
  ],
  archivist: [
    { label: 'Find a cast', to: () => paths.archive.href(), action: 'casts.read' },
    { label: 'Storage places', to: () => paths.places.href(), action: 'casts.read' },
  ],
  performer: [{ label: 'My record', to: (s) => (s.performerIds[0] ? paths.performer.href(s.performerIds[0]) : null), action: 'performer.self' }],
};

/** Where this seat's work starts; shown so that a quiet day still offers the next step. */
export function StartActions() {
  const session = useSession();
  const role = session.current?.role;
  const actions = (role ? (START_ACTIONS[role] ?? []) : []).flatMap((a) => {
    const to = seatCan(session, a.action) ? a.to(session) : null;
    return to ? [{ label: a.label, to }] : [];
  });
  if (actions.length === 0) return null;
  return (
    <div className="flex flex-wrap gap-3" data-testid="start-actions">
      {actions.map((a, i) => (
        <ButtonLink key={a.to} to={a.to} variant={i === 0 ? 'primary' : 'secondary'}>
          {a.label}
        </ButtonLink>
      ))}
    </div>
  );
}
