import { authRoutes } from './auth/routes.ts';
import { auditRoutes } from './features/audit/routes.ts';
import { archiveRoutes } from './features/archive/archive-routes.ts';
import { castRoutes } from './features/archive/cast-routes.ts';
import { locationRoutes } from './features/archive/location-routes.ts';
import { healthRoutes } from './features/health/routes.ts';
import { identityRoutes } from './features/performers/identity-routes.ts';
import { outboxRoutes } from './features/outbox/routes.ts';
import { recordsExportRoutes } from './features/records-export/routes.ts';
import { performerRoutes } from './features/performers/routes.ts';
import { bookingRoutes } from './features/bookings/routes.ts';
import { patchTestRoutes } from './features/patch-tests/routes.ts';
import { buildRoutes } from './features/builds/routes.ts';
import { kitRoutes } from './features/kits/routes.ts';
import { checkRoutes } from './features/checks/routes.ts';
import { applicationRoutes } from './features/applications/routes.ts';
import { consentRoutes } from './features/consents/consent-routes.ts';
import { signingRoutes } from './features/consents/signing-routes.ts';
import { bundleRoutes } from './features/consents/bundle-routes.ts';
import { noticeRoutes } from './features/consents/notice-routes.ts';
import { templateRoutes } from './features/consents/template-routes.ts';
import { productionRoutes } from './features/productions/routes.ts';
import { ingredientRoutes } from './features/catalogue/ingredient-routes.ts';
import { productRoutes } from './features/catalogue/routes.ts';
import { protocolRoutes } from './features/protocols/routes.ts';
import { sessionRoutes } from './features/session/routes.ts';
import { userRoutes } from './features/users/routes.ts';
import { defineRoute, type AnyRoute, buildOpenApi } from './http/route.ts';

const featureRoutes: AnyRoute[] = [
  ...healthRoutes,
  ...authRoutes,
  ...sessionRoutes,
  ...userRoutes,
  ...productionRoutes,
  ...outboxRoutes,
  ...performerRoutes,
  ...identityRoutes,
  ...recordsExportRoutes,
  ...templateRoutes,
  ...signingRoutes,
  ...bundleRoutes,
  ...noticeRoutes,
  ...consentRoutes,
  ...bookingRoutes,
  ...patchTestRoutes,
  ...ingredientRoutes,
  ...productRoutes,
  ...protocolRoutes,
  ...locationRoutes,
  ...archiveRoutes,
  ...castRoutes,
  ...buildRoutes,
  ...kitRoutes,
  ...checkRoutes,
  ...applicationRoutes,
  ...auditRoutes,
];

const openApiRoute = defineRoute({
  method: 'get',
  path: '/api/openapi.json',
  summary: 'This document: OpenAPI 3.1, generated from the same zod schemas the server validates with',
  tag: 'system',
  auth: 'public',
  handler: async () => openApiDocument(),
});

/** Every API route, in mount order; the OpenAPI document is built from this same list. */
export const allRoutes: AnyRoute[] = [...featureRoutes, openApiRoute];

let cachedDoc: unknown = null;
export function openApiDocument(): unknown {
  cachedDoc ??= buildOpenApi(allRoutes, { title: 'Plinth API', version: '0.1.0' });
  return cachedDoc;
}
