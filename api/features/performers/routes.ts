import type { AnyRoute } from '../../http/route.ts';

export const performerRoutes: AnyRoute[] = [];
