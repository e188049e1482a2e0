import { AuditPageSchema, AuditQuerySchema } from '#shared/schemas/admin.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { listAuditPage } from './repo.ts';
import { healthReadsOf } from './service.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { HealthReadListSchema } from '#shared/schemas/audit.ts';

export const auditRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/audit',
    summary: 'The audit log (newest first by default), filterable by action',
    tag: 'admin',
    auth: 'session',
    requires: 'audit.read',
    query: AuditQuerySchema,
    response: AuditPageSchema,
    errors: [403],
    handler: ({ ctx, query }) => listAuditPage(ctx.db, query),
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/health-reads',
    summary: "Who has read this performer's health details, and when (the performer and the designated lead)",
    tag: 'admin',
    auth: 'session',
    params: IdParamsSchema,
    response: HealthReadListSchema,
    errors: [403, 404],
    handler: async ({ ctx, actor, params }) => ({ items: await healthReadsOf(ctx, actor, params.id) }),
  }),
];
