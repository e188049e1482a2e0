import { useQuery } from '@tanstack/react-query';
import { Navigate } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { Wordmark } from '../../../components/layout/wordmark.tsx';
import { paths } from '../../../lib/paths.ts';
import { useDocumentTitle } from '../../../lib/use-document-title.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { SignOutButton } from '../../../components/layout/sign-out-button.tsx';
import { useSession } from '../../../lib/session/session-context.tsx';

export function NoAccessPage() {
  useDocumentTitle('No access yet');
  const session = useSession();
  const query = useQuery(sessionQueryOptions());

  if (session.seats.length > 0) return <Navigate to={paths.home.href()} replace />;

  return (
    <div className="flex min-h-screen items-center justify-center bg-sand-100 p-4">
      <main className="flex w-full max-w-lg flex-col gap-5 rounded-2xl border border-sand-300 bg-white p-8 shadow-sm">
        <Wordmark />
        <h1 className="text-2xl font-bold text-ink-900" data-testid="no-access-heading">
          No access yet
        </h1>
        <p className="text-ink-700">
          You are signed in, but you have no role on any production. A studio administrator must give you a role before
          you can use Plinth. Tell them the e-mail address you signed in with:
        </p>
        <p className="rounded-lg bg-sand-100 p-3 text-lg font-semibold break-all text-ink-900" data-testid="no-access-email">
          {session.user.email}
        </p>
        <div className="flex flex-wrap items-start gap-3">
          <Button variant="primary" pending={query.isFetching} pendingLabel="Checking…" onClick={() => void query.refetch()}>
            Check again
          </Button>
          <SignOutButton />
        </div>
      </main>
    </div>
  );
}
