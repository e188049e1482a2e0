import type { ReactNode } from 'react';
import type { UseQueryResult } from '@tanstack/react-query';
import { ApiError } from '../../lib/api-client.ts';
import { ErrorBanner } from './error-banner.tsx';
import { Loading } from './loading.tsx';

interface QueryViewProps<T> {
  query: UseQueryResult<T>;
  loadingLabel?: string;
  children: (data: T) => ReactNode;
}

/** The loading and error states every query needs, so no screen forgets them. */
export function QueryView<T>({ query, loadingLabel, children }: QueryViewProps<T>) {
  // Asking again cannot fix a 4xx (not found, not allowed), so only other failures offer a retry.
  const retry = query.error instanceof ApiError && query.error.isClientError ? undefined : () => void query.refetch();
  if (query.isPending) return <Loading label={loadingLabel} />;
  if (query.isError && query.data === undefined) {
    return <ErrorBanner error={query.error} onRetry={retry} />;
  }
  return (
    <>
      {query.isError ? <ErrorBanner error={query.error} title="This may be out of date." onRetry={retry} /> : null}
      {children(query.data as T)}
    </>
  );
}
