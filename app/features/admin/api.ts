import { keepPreviousData, queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  OutboxMessageDetailSchema,
  MailFailureListSchema,
  MailRetryResultSchema,
  OutboxPageSchema,
  ProductionDetailSchema,
  ProductionPageSchema,
  UserPageSchema,
  UserSchema,
  type AddMembershipInput,
  type AppointLeadInput,
  type CreateProductionInput,
  type CreateUserInput,
  type ProductionDetail,
  type UpdateProductionInput,
  type UpdateUserInput,
  type UserListQuery,
} from '#shared/schemas/admin.ts';
import { z } from 'zod';
import { api, withQuery } from '../../lib/api-client.ts';

const EndSessionsResultSchema = z.object({ ended: z.number().int() });
import { auditKey, homeKey, outboxKey, productionsKey, sessionKey, usersKey, invalidate } from '../../lib/query-keys.ts';

// ---- query shapes (outputs of the API's own query schemas, so defaults are filled in)

export type ProductionListQuery = { q?: string; page: number; pageSize: number; sort: 'name' | 'startsOn'; dir: 'asc' | 'desc' };
export type OutboxQuery = { page: number; pageSize: number };

// ---- users

export function usersQueryOptions(query: UserListQuery) {
  return queryOptions({
    queryKey: [...usersKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/users', query), UserPageSchema, signal),
    // Keep the old page on screen while the next page or sort loads, instead of flashing "Loading…".
    placeholderData: keepPreviousData,
  });
}

/** The people offered in pickers: the first hundred by name (the API's largest page). */
export const PICKER_QUERY: UserListQuery = { page: 1, pageSize: 100, sort: 'displayName', dir: 'asc', access: 'all' };
export function userPickerQueryOptions() {
  return usersQueryOptions(PICKER_QUERY);
}

export function userQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...usersKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/users/${encodeURIComponent(id)}`, UserSchema, signal),
  });
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUserInput) => api.post('/api/users', input, UserSchema),
    onSuccess: () => invalidate(queryClient, [usersKey, homeKey, auditKey]),
  });
}

/** Signs a user out everywhere: every session of theirs ends at once. */
export function useEndSessions(id: string) {
  return useMutation({ mutationFn: () => api.post(`/api/users/${encodeURIComponent(id)}/sessions/end`, {}, EndSessionsResultSchema) });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: UpdateUserInput }) =>
      api.patch(`/api/users/${encodeURIComponent(id)}`, input, UserSchema),
    onSuccess: (user) => {
      queryClient.setQueryData(userQueryOptions(user.id).queryKey, user);
      // The session too: renaming or un-admining oneself changes the header and the seats.
      return invalidate(queryClient, [usersKey, homeKey, auditKey, sessionKey, productionsKey]);
    },
  });
}

// ---- productions

export function productionsQueryOptions(query: ProductionListQuery) {
  return queryOptions({
    queryKey: [...productionsKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/productions', query), ProductionPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function productionQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...productionsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/productions/${encodeURIComponent(id)}`, ProductionDetailSchema, signal),
  });
}

/**
 * Every production write answers with the fresh detail: store it, then mark what it may have
 * changed. Team and lead changes alter people's seats and the home counts, so those go stale too.
 */
function productionWritten(queryClient: QueryClient, detail: ProductionDetail) {
  queryClient.setQueryData(productionQueryOptions(detail.id).queryKey, detail);
  return invalidate(queryClient, [[...productionsKey, 'list'], usersKey, homeKey, auditKey, sessionKey]);
}

export function useCreateProduction() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateProductionInput) => api.post('/api/productions', input, ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

function productionPath(id: string, rest = '') {
  return `/api/productions/${encodeURIComponent(id)}${rest}`;
}

export function useUpdateProduction(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateProductionInput) => api.patch(productionPath(id), input, ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

export function useAddMembership(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AddMembershipInput) => api.post(productionPath(id, '/memberships'), input, ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

export function useRemoveMembership(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (membershipId: string) =>
      api.delete(productionPath(id, `/memberships/${encodeURIComponent(membershipId)}`), ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

export function useAppointLead(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AppointLeadInput) => api.post(productionPath(id, '/lead'), input, ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

export function useEndLead(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (version: number) => api.delete(withQuery(productionPath(id, '/lead'), { version }), ProductionDetailSchema),
    onSuccess: (detail) => productionWritten(queryClient, detail),
  });
}

// ---- outbox (read-only)

export function outboxQueryOptions(query: OutboxQuery) {
  return queryOptions({
    queryKey: [...outboxKey, query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/outbox', query), OutboxPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

/** Messages Plinth could not send, waiting to be sent again. */
export function mailFailuresQueryOptions() {
  return queryOptions({
    queryKey: [...outboxKey, 'failures'] as const,
    queryFn: ({ signal }) => api.get('/api/outbox/failures', MailFailureListSchema, signal),
  });
}

export function useRetryMail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/outbox/failures/${encodeURIComponent(id)}/retry`, {}, MailRetryResultSchema),
    onSuccess: () => invalidate(queryClient, [outboxKey]),
  });
}

export function outboxMessageQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...outboxKey, 'message', id] as const,
    queryFn: ({ signal }) => api.get(`/api/outbox/${encodeURIComponent(id)}`, OutboxMessageDetailSchema, signal),
  });
}
