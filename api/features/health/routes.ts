import { HealthSchema } from '#shared/schemas/session.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { pingDatabase } from './repo.ts';

export const healthRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/health',
    summary: 'Liveness and database reachability (503 when the database is away)',
    tag: 'system',
    auth: 'public',
    sessionless: true,
    response: HealthSchema,
    errors: [503],
    async handler({ ctx, res }) {
      try {
        await pingDatabase(ctx.db);
        return { status: 'ok' as const, database: 'ok' as const };
      } catch {
        res.status(503).json({ status: 'degraded', database: 'unreachable' });
        return;
      }
    },
  }),
];
