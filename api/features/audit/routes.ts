import { AuditPageSchema, AuditQuerySchema } from '#shared/schemas/admin.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { listAuditPage } from './repo.ts';

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
];
