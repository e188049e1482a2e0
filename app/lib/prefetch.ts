import type { FetchQueryOptions } from '@tanstack/react-query';
import type { Action } from '#shared/policy.ts';
import { sessionQueryOptions } from './session/api.ts';
import { seatCanAny } from './session/seat.ts';
import { queryClient } from './query-client.ts';

// `any` only because option objects of different data types cannot share one typed array;
// each one was built (and checked) by its own typed queryOptions factory.
// oxlint-disable-next-line no-explicit-any
type PrefetchOptions = FetchQueryOptions<any, any, any, any, never>;

/**
 * For route loaders: starts a page's queries while its code loads, so the page opens with data.
 * Skipped when the acting seat may not open the page (the page then explains why), and never
 * throws: a failed request shows up as the page's own error state.
 */
export async function prefetchFor(action: Action | readonly Action[] | null, ...options: PrefetchOptions[]): Promise<void> {
  const session = await queryClient.ensureQueryData(sessionQueryOptions()).catch(() => undefined);
  if (!session || session.seats.length === 0) return;
  if (action && !seatCanAny(session, action)) return;
  await Promise.all(options.map((o) => queryClient.prefetchQuery(o)));
}
