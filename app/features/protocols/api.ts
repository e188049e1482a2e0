import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { ProtocolHistorySchema, ProtocolListSchema, ProtocolVersionSchema, type UpdateProtocolInput } from '#shared/schemas/protocols.ts';
import { api } from '../../lib/api-client.ts';
import { invalidate, protocolsKey } from '../../lib/query-keys.ts';

export function protocolsQueryOptions() {
  return queryOptions({
    queryKey: [...protocolsKey, 'list'] as const,
    queryFn: ({ signal }) => api.get('/api/protocols', ProtocolListSchema, signal),
  });
}

export function protocolQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...protocolsKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/protocols/${encodeURIComponent(id)}`, ProtocolVersionSchema, signal),
  });
}

export function protocolHistoryQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...protocolsKey, 'history', id] as const,
    queryFn: ({ signal }) => api.get(`/api/protocols/${encodeURIComponent(id)}/versions`, ProtocolHistorySchema, signal),
  });
}

/** Publishes an edit as the protocol's next version. */
export function useUpdateProtocol(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateProtocolInput) => api.put(`/api/protocols/${encodeURIComponent(id)}`, input, ProtocolVersionSchema),
    onSuccess: async (saved) => {
      queryClient.setQueryData(protocolQueryOptions(id).queryKey, saved);
      await invalidate(queryClient, [protocolsKey]);
    },
  });
}
