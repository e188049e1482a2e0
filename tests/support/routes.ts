import type { AnyRoute } from '../../api/http/route.ts';

const SAMPLE_ID = '00000000-0000-4000-8000-000000000000';

/** A concrete URL for a route pattern, with every :param filled. */
export function concretePath(route: Pick<AnyRoute, 'path'>, fill: Record<string, string> = {}): string {
  return route.path.replace(/:([A-Za-z0-9_]+)/g, (_m, name: string) => fill[name] ?? (name === 'id' && route.path.startsWith('/api/outbox') ? 'x.eml' : SAMPLE_ID));
}
