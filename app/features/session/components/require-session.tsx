import { useQuery } from '@tanstack/react-query';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { SessionContext } from '../../../lib/session/session-context.tsx';

/** The 401 of a browser lent to a performer for signing names its phase ('signing' | 'handback'). */
function lentTablet(err: unknown): boolean {
  return isApiError(err, 401) && (err.details.tablet === 'signing' || err.details.tablet === 'handback');
}

/**
 * Everything below needs a signed-in person; a 401 goes to sign-in and comes back here afterwards.
 * A browser lent as the signing tablet goes back to the tablet's screen instead: whatever address
 * is typed or reached with Back, nothing of the staff's pages shows until staff sign in again.
 */
export function RequireSession() {
  const location = useLocation();
  const session = useQuery(sessionQueryOptions());

  if (lentTablet(session.error)) return <Navigate to={paths.tablet.href()} replace />;
  if (isApiError(session.error, 401)) {
    return <Navigate to={paths.signIn.href(location.pathname + location.search)} replace />;
  }
  if (session.isPending) {
    return (
      <main className="mx-auto max-w-xl p-8">
        <Loading label="Opening Plinth…" rows={2} />
      </main>
    );
  }
  if (session.data === undefined) {
    return (
      <main className="mx-auto flex max-w-xl flex-col gap-4 p-8">
        <h1 className="text-2xl font-bold">Plinth could not open</h1>
        <ErrorBanner error={session.error} onRetry={() => void session.refetch()} />
      </main>
    );
  }
  return (
    <SessionContext value={session.data}>
      <Outlet />
    </SessionContext>
  );
}

/** A signed-in person with no seat at all has nothing to see yet but the waiting page. */
export function RequireSeat() {
  const session = useQuery(sessionQueryOptions());
  if (session.data && session.data.seats.length === 0) return <Navigate to={paths.noAccess.href()} replace />;
  return <Outlet />;
}
