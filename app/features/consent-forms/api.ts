import { queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  TemplateListSchema,
  TemplateSchema,
  TemplateVersionListSchema,
  type CreateTemplateInput,
  type Template,
  type UpdateTemplateInput,
} from '#shared/schemas/consents.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { invalidate, templatesKey } from '../../lib/query-keys.ts';

/** Consent forms at their current version; archived ones only when asked (the editor's list). */
export function templatesQueryOptions({ archived = false }: { archived?: boolean } = {}) {
  return queryOptions({
    queryKey: [...templatesKey, 'list', { archived }] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/consent-templates', { archived: archived ? 'true' : undefined }), TemplateListSchema, signal),
  });
}

export function templateQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...templatesKey, 'detail', id] as const,
    queryFn: ({ signal }) => api.get(`/api/consent-templates/${encodeURIComponent(id)}`, TemplateSchema, signal),
  });
}

export function templateVersionsQueryOptions(id: string) {
  return queryOptions({
    queryKey: [...templatesKey, 'versions', id] as const,
    queryFn: ({ signal }) => api.get(`/api/consent-templates/${encodeURIComponent(id)}/versions`, TemplateVersionListSchema, signal),
  });
}

function templateWritten(queryClient: QueryClient, template: Template) {
  queryClient.setQueryData(templateQueryOptions(template.id).queryKey, template);
  return invalidate(queryClient, [
    [...templatesKey, 'list'],
    [...templatesKey, 'versions', template.id],
  ]);
}

export function useCreateTemplate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateTemplateInput) => api.post('/api/consent-templates', input, TemplateSchema),
    onSuccess: (t) => templateWritten(queryClient, t),
  });
}

/** Publishes a new version; signed consents keep the version they were signed on. */
export function usePublishTemplate(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateTemplateInput) => api.put(`/api/consent-templates/${encodeURIComponent(id)}`, input, TemplateSchema),
    onSuccess: (t) => templateWritten(queryClient, t),
  });
}

export function useArchiveTemplate(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (archived: boolean) => api.put(`/api/consent-templates/${encodeURIComponent(id)}/archived`, { archived }, TemplateSchema),
    onSuccess: (t) => templateWritten(queryClient, t),
  });
}
