import { queryOptions } from '@tanstack/react-query';
import { HomeSchema } from '#shared/schemas/session.ts';
import { api } from '../../lib/api-client.ts';
import { homeKey } from '../../lib/query-keys.ts';

/** Today's tasks for the seat the person acts in now. */
export function homeQueryOptions() {
  return queryOptions({
    queryKey: homeKey,
    queryFn: ({ signal }) => api.get('/api/home', HomeSchema, signal),
  });
}
