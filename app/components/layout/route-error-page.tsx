import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { Button } from '../ui/button.tsx';
import { errorMessage } from '../../lib/api-client.ts';
import { useDocumentTitle } from '../../lib/use-document-title.ts';

function RouteErrorContent() {
  useDocumentTitle('Something went wrong');
  const error = useRouteError();
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : errorMessage(error);
  return (
    <>
      <h1 className="text-2xl font-bold text-graphite-900">Something went wrong</h1>
      <p role="alert" className="rounded-xl border-l-4 border-brick-700 bg-brick-50 p-4">
        {message}
      </p>
      <p className="text-graphite-700">Reloading usually fixes this (for example after Plinth was updated). Nothing you saved has been lost.</p>
      <div>
        <Button onClick={() => window.location.reload()}>Reload the page</Button>
      </div>
    </>
  );
}

/** Last resort for a crash while rendering or loading a route, e.g. a stale code chunk after an update. */
export function RouteErrorPage() {
  return (
    <main className="mx-auto flex max-w-xl flex-col gap-4 p-8">
      <RouteErrorContent />
    </main>
  );
}

/** The same, inside the app shell, so the header and navigation stay usable. */
export function RouteErrorPanel() {
  return (
    <div className="flex max-w-xl flex-col gap-4">
      <RouteErrorContent />
    </div>
  );
}
