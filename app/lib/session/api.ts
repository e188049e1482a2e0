import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { LogoutResultSchema, SessionSchema, type SelectSeatInput, type Session } from '#shared/schemas/session.ts';
import { api } from '../api-client.ts';
import { sessionKey } from '../query-keys.ts';

/** Who is signed in and the seat they act in; 401 when signed out. */
export function sessionQueryOptions() {
  return queryOptions({
    queryKey: sessionKey,
    queryFn: ({ signal }) => api.get('/api/session', SessionSchema, signal),
    // The session changes only through our own mutations or a new sign-in; no need to poll it.
    staleTime: 60_000,
    // A 401 stays a 401 until the person signs in, which is a full page load anyway; without
    // this, every screen that mounts (guard, then sign-in page) would ask again.
    retryOnMount: false,
  });
}

/** Switches the seat, then reloads everything, since every screen's data depends on the seat. */
export function useSelectSeat() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SelectSeatInput) => api.put('/api/session/current', input, SessionSchema),
    onSuccess: async (session: Session) => {
      queryClient.setQueryData(sessionKey, session);
      // Reset rather than invalidate: the previous seat's data must not linger on screen while refetching.
      await queryClient.resetQueries({ predicate: (q) => q.queryKey[0] !== sessionKey[0] });
    },
  });
}

export function useSignOut() {
  return useMutation({
    mutationFn: () => api.post('/api/auth/logout', {}, LogoutResultSchema),
    onSuccess: ({ redirectTo }) => {
      // The identity provider's logout page lives on another origin: a full navigation, not the
      // router. It also drops every cached record, so nothing of this person stays in memory.
      window.location.assign(redirectTo);
    },
  });
}
