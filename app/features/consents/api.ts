import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { OkSchema } from '#shared/schemas/common.ts';
import {
  ConsentDetailSchema,
  SigningFormSchema,
  SigningRequestListSchema,
  SigningRequestSchema,
  SubmitSignatureResultSchema,
  HandOverResultSchema,
  TabletStateSchema,
  VerifyResultSchema,
  WithdrawalLinkRequestedSchema,
  WithdrawalLinkViewSchema,
  WithdrawResultSchema,
  type CreateSigningRequestInput,
  type TabletState,
  type SubmitSignatureInput,
} from '#shared/schemas/consents.ts';
import { HealthSummarySchema, HealthWorklistSchema, WithdrawalNoticeListSchema } from '#shared/schemas/consent-notices.ts';
import { BundleLinkViewSchema, SigningBundleSchema, type CreateSigningBundleInput } from '#shared/schemas/consent-bundles.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { consentsKey, homeKey, performersKey, signingLinkKey, signingRequestsKey, tabletKey, withdrawalLinkKey, invalidate } from '../../lib/query-keys.ts';

// ---- one consent

export function consentQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...consentsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/consents/${encodeURIComponent(id)}`, ConsentDetailSchema, signal),
  });
}


export function useWithdrawConsent(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { reason?: string; version: number }) =>
      api.post(`/api/consents/${encodeURIComponent(id)}/withdraw`, input, WithdrawResultSchema),
    onSuccess: () => invalidate(queryClient, [consentsKey, performersKey, homeKey]),
  });
}

// ---- asking a performer to sign

export function signingRequestsQueryOptions(productionId: string, performerId: string) {
  return queryOptions({
    queryKey: [...signingRequestsKey, productionId, performerId, 'open'] as const,
    queryFn: ({ signal }) =>
      api.get(withQuery('/api/signing-requests', { productionId, performerId, status: 'open' }), SigningRequestListSchema, signal),
  });
}

export function useCreateSigningRequest() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateSigningRequestInput) => api.post('/api/signing-requests', input, SigningRequestSchema),
    onSuccess: () => invalidate(queryClient, [signingRequestsKey, homeKey]),
  });
}

export function useCancelSigningRequest() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/signing-requests/${encodeURIComponent(id)}/cancel`, {}, SigningRequestSchema),
    onSuccess: () => invalidate(queryClient, [signingRequestsKey, homeKey]),
  });
}

/** Lends this browser to the performer: from now on the session answers only the tablet's routes. */
export function handOver(requestId: string) {
  return api.post(`/api/signing-requests/${encodeURIComponent(requestId)}/hand-over`, {}, HandOverResultSchema);
}

// ---- the lent tablet (public)

export { TabletStateSchema, type TabletState };

export const HANDBACK: TabletState = { phase: 'handback', form: null, idempotencyKey: null };

export function tabletQueryOptions() {
  return queryOptions({
    queryKey: tabletKey,
    queryFn: ({ signal }) => api.get('/api/tablet', TabletStateSchema, signal),
    // The server alone decides what the tablet shows; always ask it afresh.
    staleTime: 0,
    gcTime: 0,
  });
}

export function submitOnTablet(input: SubmitSignatureInput) {
  return api.post('/api/tablet/submit', input, SubmitSignatureResultSchema);
}

export function declineOnTablet() {
  return api.post('/api/tablet/decline', {}, OkSchema);
}

// ---- one-time signing link (public)

export function signingLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: [...signingLinkKey, token] as const,
    queryFn: ({ signal }) => api.get(`/api/signing/${encodeURIComponent(token)}`, SigningFormSchema, signal),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    gcTime: 0,
  });
}

export function submitByLink(token: string, input: SubmitSignatureInput) {
  return api.post(`/api/signing/${encodeURIComponent(token)}`, input, SubmitSignatureResultSchema);
}

// ---- withdrawing without a sign-in (public)


export function useRequestWithdrawalLink() {
  return useMutation({
    mutationFn: (email: string) => api.post('/api/withdrawal-links', { email }, WithdrawalLinkRequestedSchema),
  });
}

export function withdrawalLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: [...withdrawalLinkKey, token] as const,
    queryFn: ({ signal }) => api.get(`/api/withdrawal-links/${encodeURIComponent(token)}`, WithdrawalLinkViewSchema, signal),
    gcTime: 0,
  });
}

export function useWithdrawByLink(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { consentId: string; reason?: string }) =>
      api.post(`/api/withdrawal-links/${encodeURIComponent(token)}/withdraw`, input, OkSchema),
    onSuccess: () => invalidate(queryClient, [[...withdrawalLinkKey, token]]),
  });
}

// ---- checking a PDF

/** The upload that checks a PDF (multipart field "file"), for useUpload().start. */
export function verifyUpload(file: File) {
  return { url: '/api/consents/verify', field: 'file', file, schema: VerifyResultSchema };
}

// ---- several forms at once

export function useCreateSigningBundle() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateSigningBundleInput) => api.post('/api/signing-bundles', input, SigningBundleSchema),
    onSuccess: () => invalidate(queryClient, [signingRequestsKey, homeKey]),
  });
}

/** Lends this browser for every form of a bundle still to sign; one hand-back at the end. */
export function handOverBundle(bundleId: string) {
  return api.post(`/api/signing-bundles/${encodeURIComponent(bundleId)}/hand-over`, {}, HandOverResultSchema);
}

export function signingBundleLinkQueryOptions(token: string) {
  return queryOptions({
    queryKey: [...signingLinkKey, 'bundle', token] as const,
    queryFn: ({ signal }) => api.get(`/api/signing-bundles/link/${encodeURIComponent(token)}`, BundleLinkViewSchema, signal),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    gcTime: 0,
  });
}

export function submitBundleForm(token: string, requestId: string, input: SubmitSignatureInput) {
  return api.post(`/api/signing-bundles/link/${encodeURIComponent(token)}/requests/${encodeURIComponent(requestId)}`, input, SubmitSignatureResultSchema);
}

// ---- the department's consent worklist

export function withdrawalNoticesQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...consentsKey, 'withdrawal-notices', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/consent-notices/withdrawals', { productionId }), WithdrawalNoticeListSchema, signal),
  });
}

export function useMarkWithdrawalsSeen() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { productionId: string; seenAt: string }) => api.post('/api/consent-notices/withdrawals/seen', input, OkSchema),
    onSuccess: () => invalidate(queryClient, [consentsKey, homeKey]),
  });
}

export function healthWorklistQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...consentsKey, 'health-worklist', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/consent-notices/health', { productionId }), HealthWorklistSchema, signal),
  });
}

export function useConfirmHealthReview() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { performerId: string; productionId: string; reviewedAt: string }) => api.post('/api/consent-notices/health/reviews', input, OkSchema),
    onSuccess: () => invalidate(queryClient, [consentsKey, homeKey]),
  });
}

export function healthSummaryQueryOptions(performerId: string) {
  return queryOptions({
    queryKey: [...consentsKey, 'health-summary', performerId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/consent-notices/health-summary', { performerId }), HealthSummarySchema, signal),
  });
}
