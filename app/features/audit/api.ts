import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { ProductionPageSchema } from '#shared/schemas/admin.ts';
import { AuditPageSchema, type AuditQuery } from '#shared/schemas/audit.ts';
import type { Session } from '#shared/schemas/session.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { auditKey, productionsKey } from '../../lib/query-keys.ts';

/**
 * The API's query for what the URL says. A designated lead reads the log of the production of the
 * seat they act in (the server still checks it); the administrator picks a production or reads all.
 */
export function auditQueryFor(params: AuditQuery, session: Session | undefined): AuditQuery {
  const seat = session?.current;
  if (seat?.role === 'lead' && seat.productionId) return { ...params, production: seat.productionId };
  return params;
}

export function auditQueryOptions(query: AuditQuery) {
  return queryOptions({
    queryKey: [...auditKey, query] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/audit', query), AuditPageSchema, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every production by name, for the administrator's production filter. */
export function auditProductionChoicesQueryOptions() {
  return queryOptions({
    queryKey: [...productionsKey, 'list', 'audit-choices'] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/productions', { pageSize: 100, sort: 'name', dir: 'asc' }), ProductionPageSchema, signal),
  });
}
