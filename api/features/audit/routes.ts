import { AuditPageSchema, AuditQuerySchema } from '#shared/schemas/audit.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { auditPage, healthReadsOf } from './service.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { HealthReadListSchema } from '#shared/schemas/audit.ts';

export const auditRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/audit',
    summary:
      'The audit log (newest first by default): every entry for the administrator, the productions they lead for a designated lead; filterable by text, performer, production, event or group of events, and days on the studio clock',
    tag: 'audit',
    auth: 'session',
    query: AuditQuerySchema,
    response: AuditPageSchema,
    errors: [403],
    handler: ({ ctx, actor, query }) => auditPage(ctx, actor, query),
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/health-reads',
    summary: "Who has read this performer's health details, and when (the performer and the designated lead)",
    tag: 'performers',
    auth: 'session',
    params: IdParamsSchema,
    response: HealthReadListSchema,
    errors: [403, 404],
    handler: async ({ ctx, actor, params }) => ({ items: await healthReadsOf(ctx, actor, params.id) }),
  }),
];
