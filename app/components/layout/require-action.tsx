import { Outlet } from 'react-router-dom';
import { ROLE_LABELS, type Action } from '#shared/policy.ts';
import { seatCanAny } from '../../lib/session/seat.ts';
import { useSession } from '../../lib/session/session-context.tsx';
import { PageHeading } from '../ui/page-heading.tsx';

/**
 * Shows a page only to a seat whose role allows it (any one of the actions, when several open it).
 * Someone holding several seats who switches away from the right one sees why the page is closed,
 * rather than a bare refusal from the API.
 */
export function RequireAction({ action }: { action: Action | readonly Action[] }) {
  const session = useSession();
  if (seatCanAny(session, action)) return <Outlet />;
  const role = session.current ? ROLE_LABELS[session.current.role] : 'this role';
  const adminSeat = session.seats.some((s) => s.role === 'admin');
  return (
    <>
      <PageHeading title="Not available in this role">Not available in this role</PageHeading>
      <p className="max-w-prose text-graphite-700">
        Acting as {role}, you cannot open this page.
        {adminSeat ? ' Switch “Acting as” to Studio administrator to use it.' : ' Ask a studio administrator if you need it.'}
      </p>
    </>
  );
}
