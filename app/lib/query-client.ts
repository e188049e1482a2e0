import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client.ts';
import { sessionKey } from './query-keys.ts';

function onError(err: unknown): void {
  // A session that ends mid-use (expiry, sign-out in another tab) makes any call 401; re-reading
  // the session lets <RequireSession> send the person to sign in instead of showing stray errors.
  if (err instanceof ApiError && err.status === 401) {
    void queryClient.invalidateQueries({ queryKey: sessionKey, exact: true });
  }
}

export const queryClient = new QueryClient({
  queryCache: new QueryCache({
    onError: (err, query) => {
      if (query.queryKey[0] !== sessionKey[0]) onError(err);
    },
  }),
  mutationCache: new MutationCache({ onError }),
  defaultOptions: {
    queries: {
      // A 4xx will not change by asking again; only network trouble and 5xx are worth a retry.
      retry: (failureCount, err) => !(err instanceof ApiError && err.isClientError) && failureCount < 2,
      // Route loaders prefetch; this keeps the page from fetching the same thing again on mount.
      staleTime: 15_000,
    },
    mutations: { retry: false },
  },
});
