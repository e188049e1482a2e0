import { keepPreviousData, queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  ApplianceOutlookListSchema,
  ApplianceOutlookSchema,
  BuildDetailSchema,
  BuildPageSchema,
  MoldOptionListSchema,
  PerformerBuildsSchema,
  type BuildDetail,
  type BuildListQuery,
  type CreateBuildInput,
  type MarkPieceInput,
  type SetPlanInput,
  type UpdateBuildInput,
} from '#shared/schemas/builds.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { buildsKey, homeKey, invalidate } from '../../lib/query-keys.ts';

const buildPath = (id: string, rest = '') => `/api/appliance-builds/${encodeURIComponent(id)}${rest}`;

// ---- reads

export function buildsQueryOptions(query: BuildListQuery) {
  return queryOptions({
    queryKey: [...buildsKey, 'list', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/appliance-builds', query), BuildPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function buildQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...buildsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(buildPath(id), BuildDetailSchema, signal),
  });
}

export function moldOptionsQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...buildsKey, 'molds', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/appliance-molds', { productionId }), MoldOptionListSchema, signal),
  });
}

export function outlooksQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...buildsKey, 'outlooks', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/appliance-outlooks', { productionId }), ApplianceOutlookListSchema, signal),
  });
}

export function performerBuildsQueryOptions(performerId: string) {
  return queryOptions({
    queryKey: [...buildsKey, 'performer', performerId] as const,
    queryFn: ({ signal }) => api.get(`/api/performers/${encodeURIComponent(performerId)}/appliance-builds`, PerformerBuildsSchema, signal),
  });
}

// ---- writes

/** Every build write answers with the fresh detail: keep it, and mark the lists, outlooks and home it may change. */
export async function buildWritten(queryClient: QueryClient, detail: BuildDetail) {
  queryClient.setQueryData(buildQueryOptions(detail.id).queryKey, detail);
  await invalidate(queryClient, [[...buildsKey, 'list'], [...buildsKey, 'outlooks'], [...buildsKey, 'performer'], homeKey]);
}

function useBuildMutation<I>(fn: (input: I) => Promise<BuildDetail>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: (detail) => buildWritten(queryClient, detail) });
}

export function useCreateBuild() {
  return useBuildMutation((input: CreateBuildInput) => api.post('/api/appliance-builds', input, BuildDetailSchema));
}

export function useUpdateBuild(id: string) {
  return useBuildMutation((input: UpdateBuildInput) => api.put(buildPath(id), input, BuildDetailSchema));
}

export function useMarkPiece() {
  return useBuildMutation((input: MarkPieceInput & { pieceId: string }) => {
    const { pieceId, ...body } = input;
    return api.put(`/api/appliance-pieces/${encodeURIComponent(pieceId)}/status`, body, BuildDetailSchema);
  });
}

export function useSetPlan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SetPlanInput) => api.put('/api/appliance-plans', input, ApplianceOutlookSchema),
    onSuccess: () => invalidate(queryClient, [buildsKey, homeKey]),
  });
}

/** The photo upload (multipart field "photo"), for useUpload().start. */
export function buildPhotoUpload(buildId: string, file: File) {
  return { url: buildPath(buildId, '/photo'), method: 'PUT' as const, field: 'photo', file, schema: BuildDetailSchema };
}
