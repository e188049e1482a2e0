import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { Navigate } from 'react-router-dom';
import { Wordmark } from '../../../components/layout/wordmark.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { useDocumentTitle } from '../../../lib/use-document-title.ts';
import { HANDBACK, declineOnTablet, submitOnTablet, tabletQueryOptions } from '../api.ts';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { SigningFormView } from '../components/signing-form.tsx';

/**
 * The department's tablet while it is lent to a performer. No shell, no navigation and nothing of
 * the staff member's session: the server says what to show (the one form, or the hand-back screen).
 */
export function TabletPage() {
  const queryClient = useQueryClient();
  const tablet = useQuery(tabletQueryOptions());

  // Whatever the tablet showed before it was lent, none of it stays in memory.
  useEffect(() => {
    queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== tabletQueryOptions().queryKey[0] });
  }, [queryClient]);

  if (tablet.isPending) {
    return (
      <PublicFrame title="Signing">
        <Loading label="Opening the form…" rows={4} />
      </PublicFrame>
    );
  }
  if (tablet.isError) {
    return (
      <PublicFrame title="Signing">
        <h1 className="text-3xl font-bold text-ink-900">The form could not be opened</h1>
        <ErrorBanner error={tablet.error} onRetry={() => void tablet.refetch()} />
        <HandBackNote />
      </PublicFrame>
    );
  }
  const state = tablet.data;
  if (state.phase === 'none') return <Navigate to={paths.signIn.href()} replace />;
  if (state.phase === 'handback' || !state.form || !state.idempotencyKey) return <HandBackScreen />;

  const done = () => {
    window.history.replaceState(null, '', paths.tablet.href());
    window.scrollTo({ top: 0 });
    // In a bundle the server has moved on to the next form (or to the hand-back screen): ask it which.
    if (state.progress) {
      void tablet.refetch();
      return;
    }
    // The server has moved to the hand-back phase; drop the form from memory and history alike.
    queryClient.setQueryData(tabletQueryOptions().queryKey, HANDBACK);
  };

  return (
    <PublicFrame title={state.form.template.title}>
      <SigningFormView
        key={state.form.requestId}
        form={state.form}
        idempotencyKey={state.idempotencyKey}
        mode="tablet"
        submit={async (input) => {
          try {
            return await submitOnTablet(input);
          } catch (err) {
            // Signed already, cancelled, or no longer lent: the server's phase decides what shows next.
            if (isApiError(err, 401) || isApiError(err, 404) || isApiError(err, 409)) void tablet.refetch();
            throw err;
          }
        }}
        onSigned={done}
        decline={declineOnTablet}
        onDeclined={done}
        progress={state.progress}
      />
    </PublicFrame>
  );
}

function HandBackNote() {
  return <p className="text-lg text-ink-700">Please hand the tablet back to the department.</p>;
}

/**
 * After signing (or declining): nothing of what was entered, and one way out, which makes staff
 * type their password again at the identity provider.
 */
function HandBackScreen() {
  useDocumentTitle('Hand the tablet back');
  return (
    <div className="flex min-h-screen items-center justify-center bg-sand-100 p-4">
      <main className="flex w-full max-w-xl flex-col items-start gap-6 rounded-2xl border border-sand-300 bg-white p-8 shadow-sm sm:p-10" data-testid="handback">
        <Wordmark size="lg" />
        <h1 className="text-3xl font-bold text-ink-900" data-testid="handback-heading">
          Thank you.
        </h1>
        <p className="text-2xl text-ink-900">Please hand the tablet back to the department.</p>
        <div className="w-full border-t border-sand-200 pt-6">
          {/* A full page visit: the identity provider asks for the password before any staff page opens. */}
          <Button
            variant="secondary"
            className="min-h-14 px-6 text-lg"
            onClick={() => window.location.assign(serverPaths.reauth(paths.performers.href()))}
            data-testid="staff-sign-in-again"
          >
            Staff: sign in again
          </Button>
        </div>
      </main>
    </div>
  );
}
