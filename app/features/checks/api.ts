import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { ApplicationListSchema, ApplicationSchema, IncidentListSchema, IncidentSchema, LotTraceSchema, type FinishApplicationInput, type LogApplicationInput, type SkinCheckInput } from '#shared/schemas/applications.ts';
import { CheckSchema, PieceChoiceListSchema, LeadRequestListSchema, LeadRequestSchema, type Check, type LeadDecisionInput, type RunCheckInput } from '#shared/schemas/checks.ts';
import { KitListSchema, KitSchema, type CreateKitInput, type UpdateKitInput } from '#shared/schemas/kits.ts';
import { ProductPageSchema } from '#shared/schemas/catalogue.ts';
import { PerformerPageSchema } from '#shared/schemas/performers.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { applicationsKey, checksKey, homeKey, incidentsKey, invalidate, kitsKey, leadRequestsKey, productsKey, performersKey } from '../../lib/query-keys.ts';

const enc = encodeURIComponent;

// ---- reads

export function kitsQueryOptions(productionId: string) {
  return queryOptions({ queryKey: [...kitsKey, productionId] as const, queryFn: ({ signal }) => api.get(withQuery('/api/kits', { productionId }), KitListSchema, signal) });
}

/** The whole catalogue for choosing products (the studio's stock is a few dozen products). */
export function productChoicesQueryOptions() {
  return queryOptions({ queryKey: [...productsKey, 'choices'] as const, queryFn: ({ signal }) => api.get(withQuery('/api/products', { pageSize: 100, sort: 'name' }), ProductPageSchema, signal) });
}

export function performerSearchQueryOptions(productionId: string, q: string) {
  return queryOptions({
    queryKey: [...performersKey, 'check-search', productionId, q] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/performers', { productionId, q: q || undefined, pageSize: 8 }), PerformerPageSchema, signal),
  });
}

/** A check as it stands; while a request waits on the lead it is asked again every few seconds, so the answer shows without a reload. */
export function checkQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...checksKey, id] as const,
    queryFn: ({ signal }) => api.get(`/api/checks/${enc(id)}`, CheckSchema, signal),
    refetchInterval: (query) => (query.state.data?.items.some((i) => i.request?.status === 'waiting') ? 3000 : false),
  });
}

export function applicationQueryOptions(id: string) {
  return queryOptions({ queryKey: [...applicationsKey, id] as const, queryFn: ({ signal }) => api.get(`/api/applications/${enc(id)}`, ApplicationSchema, signal) });
}

export function applicationsQueryOptions(productionId: string, day: string) {
  return queryOptions({ queryKey: [...applicationsKey, 'list', productionId, day] as const, queryFn: ({ signal }) => api.get(withQuery('/api/applications', { productionId, day }), ApplicationListSchema, signal) });
}

export function leadRequestsQueryOptions(productionId: string, status?: 'waiting') {
  return queryOptions({ queryKey: [...leadRequestsKey, 'list', productionId, status] as const, queryFn: ({ signal }) => api.get(withQuery('/api/lead-requests', { productionId, status }), LeadRequestListSchema, signal) });
}

export function pieceChoicesQueryOptions(productionId: string, performerId: string) {
  return queryOptions({ queryKey: [...checksKey, 'pieces', productionId, performerId] as const, queryFn: ({ signal }) => api.get(withQuery('/api/checks/pieces', { productionId, performerId }), PieceChoiceListSchema, signal) });
}

export function waitingChecksQueryOptions(productionId: string) {
  return queryOptions({ queryKey: [...leadRequestsKey, 'waiting-checks', productionId] as const, queryFn: ({ signal }) => api.get(withQuery('/api/checks/waiting', { productionId }), LeadRequestListSchema, signal), refetchInterval: 15_000 });
}

export function leadRequestQueryOptions(id: string) {
  return queryOptions({ queryKey: [...leadRequestsKey, id] as const, queryFn: ({ signal }) => api.get(`/api/lead-requests/${enc(id)}`, LeadRequestSchema, signal) });
}

export function incidentsQueryOptions(productionId: string, status?: 'open') {
  return queryOptions({ queryKey: [...incidentsKey, 'list', productionId, status] as const, queryFn: ({ signal }) => api.get(withQuery('/api/incidents', { productionId, status }), IncidentListSchema, signal) });
}

export function incidentQueryOptions(id: string) {
  return queryOptions({ queryKey: [...incidentsKey, id] as const, queryFn: ({ signal }) => api.get(`/api/incidents/${enc(id)}`, IncidentSchema, signal) });
}

export function lotTraceQueryOptions(id: string) {
  return queryOptions({ queryKey: ['lot-trace', id] as const, queryFn: ({ signal }) => api.get(`/api/lots/${enc(id)}/trace`, LotTraceSchema, signal) });
}

// ---- writes

export function useSaveKit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (v: { id?: string; create?: CreateKitInput; update?: UpdateKitInput }) => (v.id ? api.put(`/api/kits/${enc(v.id)}`, v.update, KitSchema) : api.post('/api/kits', v.create, KitSchema)),
    onSuccess: () => invalidate(queryClient, [kitsKey]),
  });
}

export function useRunCheck() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RunCheckInput) => api.post('/api/checks', input, CheckSchema),
    onSuccess: (check) => queryClient.setQueryData(checkQueryOptions(check.id).queryKey, check),
  });
}

export function useAskLead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (v: { checkId: string; formulationId: string }) => api.post(`/api/checks/${enc(v.checkId)}/requests`, { formulationId: v.formulationId }, CheckSchema),
    onSuccess: (check: Check) => {
      queryClient.setQueryData(checkQueryOptions(check.id).queryKey, check);
      return invalidate(queryClient, [homeKey]);
    },
  });
}

export function useDecideRequest(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: LeadDecisionInput) => api.post(`/api/lead-requests/${enc(id)}/decision`, input, LeadRequestSchema),
    onSuccess: () => invalidate(queryClient, [leadRequestsKey, checksKey, homeKey]),
  });
}

export function useLogApplication() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: LogApplicationInput) => api.post('/api/applications', input, ApplicationSchema),
    onSuccess: (a) => {
      queryClient.setQueryData(applicationQueryOptions(a.id).queryKey, a);
      return invalidate(queryClient, [applicationsKey, checksKey, homeKey]);
    },
  });
}

export function useFinishApplication(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: FinishApplicationInput) => api.post(`/api/applications/${enc(id)}/end`, input, ApplicationSchema),
    onSuccess: (a) => {
      queryClient.setQueryData(applicationQueryOptions(a.id).queryKey, a);
      return invalidate(queryClient, [homeKey]);
    },
  });
}

export function useSkinCheck(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SkinCheckInput) => api.post(`/api/applications/${enc(id)}/skin-check`, input, ApplicationSchema),
    onSuccess: (a) => {
      queryClient.setQueryData(applicationQueryOptions(a.id).queryKey, a);
      return invalidate(queryClient, [homeKey, incidentsKey]);
    },
  });
}

export function useCloseIncident(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { note: string; version: number }) => api.post(`/api/incidents/${enc(id)}/close`, input, IncidentSchema),
    onSuccess: () => invalidate(queryClient, [incidentsKey, homeKey]),
  });
}
