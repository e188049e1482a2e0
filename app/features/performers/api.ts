import { keepPreviousData, queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { IdSchema } from '#shared/schemas/common.ts';
import {
  CsvImportResultSchema,
  PerformerDetailSchema,
  PerformerListQuerySchema,
  PerformerPageSchema,
  type CreatePerformerInput,
  type CsvImportResult,
  type PerformerDetail,
  type PerformerListQuery,
  type UpdatePerformerInput,
} from '#shared/schemas/performers.ts';
import { HealthReadListSchema } from '#shared/schemas/audit.ts';
import { IdentityMailSentSchema } from '#shared/schemas/identity.ts';
import { api, isApiError, withQuery } from '../../lib/api-client.ts';
import { bookingsKey, homeKey, performersKey, sessionKey, invalidate } from '../../lib/query-keys.ts';

// ---- the registry list

/**
 * The list's URL state. `productionId` may also be "all" (every production the person sees
 * performers on); left out, it means the acting seat's production, so a plain link opens there.
 */
export const PerformerListParamsSchema = PerformerListQuerySchema.extend({
  productionId: z.union([IdSchema, z.literal('all')]).optional(),
});
export type PerformerListParams = z.output<typeof PerformerListParamsSchema>;

/** The API's query for what the URL says, with the seat's production filled in. */
export function performerQueryFor(params: PerformerListParams, seatProductionId: string | null): PerformerListQuery {
  const productionId = params.productionId === 'all' ? undefined : (params.productionId ?? seatProductionId ?? undefined);
  return { ...params, productionId };
}

export function performersQueryOptions(query: PerformerListQuery) {
  return queryOptions({
    queryKey: [...performersKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/performers', query), PerformerPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function performerQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...performersKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/performers/${encodeURIComponent(id)}`, PerformerDetailSchema, signal),
  });
}

function performerPath(id: string, rest = '') {
  return `/api/performers/${encodeURIComponent(id)}${rest}`;
}

/** Every performer write answers with the fresh detail: store it, then mark the lists it may change. */
export function performerWritten(queryClient: QueryClient, detail: PerformerDetail) {
  queryClient.setQueryData(performerQueryOptions(detail.id).queryKey, detail);
  return invalidate(queryClient, [[...performersKey, 'list'], homeKey, bookingsKey]);
}

export function useCreatePerformer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreatePerformerInput) => api.post('/api/performers', input, PerformerDetailSchema),
    onSuccess: (detail) => performerWritten(queryClient, detail),
  });
}

export function useUpdatePerformer(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdatePerformerInput) => api.patch(performerPath(id), input, PerformerDetailSchema),
    onSuccess: (detail) => performerWritten(queryClient, detail),
  });
}

/** Staff only ever unlink: linking is the performer's own act (an invitation they accept). */
export function useUnlinkAccount(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (version: number) => api.put(performerPath(id, '/account'), { userId: null, version }, PerformerDetailSchema),
    onSuccess: async (detail) => {
      await performerWritten(queryClient, detail);
      // The linked person's roles changed; if that is the person signed in, their seats did too.
      await invalidate(queryClient, [sessionKey]);
    },
  });
}

/** Invites the performer to link a sign-in of their own, at their confirmed address. */
export function useInviteToSignIn(id: string) {
  return useMutation({ mutationFn: () => api.post(performerPath(id, '/account-invitation'), {}, IdentityMailSentSchema) });
}

/** Sends the confirmation request to the performer's unconfirmed address again. */
export function useResendConfirmation(id: string) {
  return useMutation({ mutationFn: () => api.post(performerPath(id, '/email-confirmation'), {}, IdentityMailSentSchema) });
}

/** The portrait upload (multipart field "portrait"), for useUpload().start; it answers with the fresh detail. */
export function portraitUpload(id: string, file: File) {
  return { url: performerPath(id, '/portrait'), method: 'PUT' as const, field: 'portrait', file, schema: PerformerDetailSchema };
}

export function useRemovePortrait(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.delete(performerPath(id, '/portrait')),
    onSuccess: () => invalidate(queryClient, [[...performersKey, 'detail', id], [...performersKey, 'list']]),
  });
}

// ---- CSV import

/** The CSV upload (multipart field "file"): a preview (commit false) or the import itself. */
export function importUpload(productionId: string, commit: boolean, file: File) {
  return { url: withQuery('/api/performers/import', { productionId, commit }), field: 'file', file, schema: CsvImportResultSchema };
}

/**
 * A refused commit answers 400 with the same row-by-row report in details.result, so the page
 * can show exactly which lines stopped it. Anything else is a plain error.
 */
export function importReportOf(err: unknown): CsvImportResult | null {
  if (!isApiError(err, 400)) return null;
  const parsed = CsvImportResultSchema.safeParse(err.details.result);
  return parsed.success ? parsed.data : null;
}

export function invalidateAfterImport(queryClient: QueryClient) {
  return invalidate(queryClient, [performersKey, homeKey]);
}

/** Who has read this performer's health details, and when (only the performer and the lead may ask). */
export function healthReadsQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...performersKey, 'health-reads', id] as const,
    queryFn: ({ signal }) => api.get(performerPath(id, '/health-reads'), HealthReadListSchema, signal),
  });
}
