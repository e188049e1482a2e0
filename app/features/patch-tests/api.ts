import { queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { PatchTestDetailSchema, PatchTestListSchema, PerformerPatchTestsSchema, type BookPatchTestInput, type OverrideInput, type PatchTestDetail, type ReadingsInput } from '#shared/schemas/patch-test-log.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { bookingsKey, homeKey, invalidate, patchTestsKey, performersKey } from '../../lib/query-keys.ts';

const testPath = (id: string, rest = '') => `/api/patch-tests/${encodeURIComponent(id)}${rest}`;

export function patchTestQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...patchTestsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(testPath(id), PatchTestDetailSchema, signal),
  });
}

export function productionTestsQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...patchTestsKey, 'production', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/patch-tests', { productionId }), PatchTestListSchema, signal),
  });
}

/** A performer's tests and clearances: the page of the timeline and of the shared-ingredient Cautions shown (first pages by default). */
export function performerPatchTestsQueryOptions(performerId: string, pages: { testsPage?: number; sharedPage?: number } = {}) {
  const testsPage = pages.testsPage ?? 1;
  const sharedPage = pages.sharedPage ?? 1;
  return queryOptions({
    queryKey: [...patchTestsKey, 'performer', performerId, testsPage, sharedPage] as const,
    queryFn: ({ signal }) =>
      api.get(
        withQuery(`/api/performers/${encodeURIComponent(performerId)}/patch-tests`, { ...(testsPage > 1 ? { testsPage } : {}), ...(sharedPage > 1 ? { sharedPage } : {}) }),
        PerformerPatchTestsSchema,
        signal,
      ),
  });
}

/** The photo route; the browser sends the session cookie with it. */
export function readingPhotoUrl(testId: string, photoId: string, size: 'photo' | 'thumbnail' = 'thumbnail'): string {
  return withQuery(testPath(testId, `/photos/${encodeURIComponent(photoId)}`), { size });
}

/** Every test write answers with the fresh detail: keep it, and mark the lists, the performer's record and the home. */
export async function testWritten(queryClient: QueryClient, detail: PatchTestDetail) {
  queryClient.setQueryData(patchTestQueryOptions(detail.id).queryKey, detail);
  await invalidate(queryClient, [patchTestsKey, bookingsKey, performersKey, homeKey]);
}

function useTestMutation<I>(fn: (input: I) => Promise<PatchTestDetail>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: (detail) => testWritten(queryClient, detail) });
}

export function useBookTest() {
  return useTestMutation((input: BookPatchTestInput) => api.post('/api/patch-tests', input, PatchTestDetailSchema));
}

type Step = 'apply' | 'removal' | 'close' | 'cancel' | 'reschedule';
export function useTestStep(id: string, step: Step) {
  return useTestMutation((body: Record<string, unknown>) => api.post(testPath(id, `/${step}`), body, PatchTestDetailSchema));
}

export function useRecordReadings(id: string) {
  return useTestMutation((input: ReadingsInput) => api.post(testPath(id, '/readings'), input, PatchTestDetailSchema));
}

export function useOverride(performerId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: OverrideInput) => api.post(`/api/performers/${encodeURIComponent(performerId)}/clearance-overrides`, input, PerformerPatchTestsSchema),
    onSuccess: (data) => {
      queryClient.setQueryData(performerPatchTestsQueryOptions(performerId).queryKey, data);
      // A decided product leaves the shared-ingredient pages: the later pages are read again.
      return invalidate(queryClient, [homeKey, [...patchTestsKey, 'performer', performerId]]);
    },
  });
}
