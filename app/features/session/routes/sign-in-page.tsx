import { useQuery } from '@tanstack/react-query';
import { Navigate, useSearchParams } from 'react-router-dom';
import { buttonClasses } from '../../../components/ui/button.tsx';
import { Wordmark } from '../../../components/layout/wordmark.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { safeReturnTo, serverPaths } from '../../../lib/paths.ts';
import { useDocumentTitle } from '../../../lib/use-document-title.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';

export function SignInPage() {
  useDocumentTitle('Sign in');
  const [params] = useSearchParams();
  const returnTo = safeReturnTo(params.get('returnTo'));
  const session = useQuery(sessionQueryOptions());

  if (session.data) return <Navigate to={returnTo} replace />;
  // A 401 is the normal answer here; anything else means the server itself is in trouble.
  const serverTrouble = session.isError && !isApiError(session.error, 401);

  return (
    <div className="flex min-h-screen items-center justify-center bg-sand-100 p-4">
      <main className="flex w-full max-w-lg flex-col gap-6 rounded-2xl border border-sand-300 bg-white p-8 shadow-sm">
        <Wordmark size="lg" />
        <div className="flex flex-col gap-3">
          <h1 className="text-2xl font-bold text-ink-900">Sign in to Plinth</h1>
          <p className="text-lg text-ink-700">
            Plinth keeps a make-up department’s safety and archive records in one place: performers, their consents, skin
            patch tests and stored life casts.
          </p>
        </div>
        {serverTrouble ? (
          <p role="alert" className="rounded-lg bg-amber-100 p-3 text-amber-800">
            Plinth cannot reach its server right now, so signing in may not work. Try again in a moment.
          </p>
        ) : null}
        {/* A plain link: sign-in is a full page visit to the identity provider, never a fetch. */}
        <a href={serverPaths.login(returnTo)} className={buttonClasses('primary', 'self-start px-8 text-lg')} data-testid="sign-in">
          Sign in
        </a>
        <p className="border-t border-sand-200 pt-4 text-sm text-ink-600">
          Plinth records skin screening and consent; it is not a medical diagnosis.
        </p>
      </main>
    </div>
  );
}
