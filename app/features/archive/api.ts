import { keepPreviousData, queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  CastDetailSchema,
  CastPageSchema,
  LabelTargetSchema,
  LocationDetailSchema,
  LocationTreeSchema,
  PeopleSchema,
  PerformerCastsSchema,
  PhotoSchema,
  RetentionListSchema,
  type CastDetail,
  type CastListQuery,
  type ConditionCheckInput,
  type CreateCastInput,
  type CreateLocationInput,
  type MovementInput,
  type UpdateCastInput,
  type UpdateLocationInput,
} from '#shared/schemas/archive.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { archiveKey, homeKey, invalidate, performersKey } from '../../lib/query-keys.ts';

const castPath = (id: string, rest = '') => `/api/casts/${encodeURIComponent(id)}${rest}`;
const placePath = (id: string) => `/api/archive/locations/${encodeURIComponent(id)}`;

// ---- reads

export function castsQueryOptions(query: CastListQuery) {
  return queryOptions({
    queryKey: [...archiveKey, 'casts', query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/casts', query), CastPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

export function castQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...archiveKey, 'cast', id] as const,
    queryFn: ({ signal }) => api.get(castPath(id), CastDetailSchema, signal),
  });
}

export function castPeopleQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...archiveKey, 'people', id] as const,
    queryFn: ({ signal }) => api.get(castPath(id, '/people'), PeopleSchema, signal),
    staleTime: 5 * 60_000,
  });
}

export function placesQueryOptions() {
  return queryOptions({
    queryKey: [...archiveKey, 'places'] as const,
    queryFn: ({ signal }) => api.get('/api/archive/locations', LocationTreeSchema, signal),
  });
}

export function placeQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...archiveKey, 'place', id] as const,
    queryFn: ({ signal }) => api.get(placePath(id), LocationDetailSchema, signal),
  });
}

export function labelQueryOptions(code: string) {
  return queryOptions({
    queryKey: [...archiveKey, 'label', code] as const,
    queryFn: ({ signal }) => api.get(`/api/archive/labels/${encodeURIComponent(code)}`, LabelTargetSchema, signal),
    staleTime: 0,
  });
}

export function retentionQueryOptions() {
  return queryOptions({
    queryKey: [...archiveKey, 'retention'] as const,
    queryFn: ({ signal }) => api.get('/api/archive/retention', RetentionListSchema, signal),
  });
}

export function performerCastsQueryOptions(performerId: string) {
  return queryOptions({
    queryKey: [...archiveKey, 'performer', performerId] as const,
    queryFn: ({ signal }) => api.get(`/api/performers/${encodeURIComponent(performerId)}/casts`, PerformerCastsSchema, signal),
  });
}

// ---- writes: every cast write answers with the fresh detail; lists and home may change with it

function castWritten(queryClient: QueryClient, detail: CastDetail) {
  queryClient.setQueryData(castQueryOptions(detail.id).queryKey, detail);
  return invalidate(queryClient, [[...archiveKey, 'casts'], [...archiveKey, 'places'], [...archiveKey, 'place'], [...archiveKey, 'retention'], [...archiveKey, 'performer'], homeKey, performersKey]);
}

function archiveChanged(queryClient: QueryClient) {
  return invalidate(queryClient, [archiveKey, homeKey]);
}

export function useCreateCast() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateCastInput) => api.post('/api/casts', input, CastDetailSchema),
    onSuccess: (detail) => castWritten(queryClient, detail),
  });
}

export function useUpdateCast(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateCastInput) => api.patch(castPath(id), input, CastDetailSchema),
    onSuccess: (detail) => castWritten(queryClient, detail),
  });
}

export function useRecordMovement(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: MovementInput) => api.post(castPath(id, '/movements'), input, CastDetailSchema),
    onSuccess: (detail) => castWritten(queryClient, detail),
  });
}

export function useRecordConditionCheck(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ConditionCheckInput) => api.post(castPath(id, '/condition-checks'), input, CastDetailSchema),
    onSuccess: (detail) => castWritten(queryClient, detail),
  });
}

/** One photo upload (multipart field "photo"), for useUpload().start; optionally onto a condition check. */
export function photoUpload(castId: string, file: File, conditionCheckId?: string) {
  return { url: withQuery(castPath(castId, '/photos'), { conditionCheckId }), field: 'photo', file, schema: PhotoSchema };
}

export function photosAdded(queryClient: QueryClient, castId: string) {
  return invalidate(queryClient, [castQueryOptions(castId).queryKey, [...archiveKey, 'casts'], [...archiveKey, 'performer']]);
}

export function useRemovePhoto(castId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (photoId: string) => api.delete(castPath(castId, `/photos/${encodeURIComponent(photoId)}`)),
    onSuccess: () => photosAdded(queryClient, castId),
  });
}

export function useCreatePlace() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateLocationInput) => api.post('/api/archive/locations', input, LocationDetailSchema),
    onSuccess: () => archiveChanged(queryClient),
  });
}

export function useUpdatePlace(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateLocationInput) => api.patch(placePath(id), input, LocationDetailSchema),
    onSuccess: (detail) => {
      queryClient.setQueryData(placeQueryOptions(id).queryKey, detail);
      return archiveChanged(queryClient);
    },
  });
}

export function useDeletePlace(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (version: number) => api.delete(withQuery(placePath(id), { version })),
    onSuccess: () => archiveChanged(queryClient),
  });
}
