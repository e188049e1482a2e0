import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
import helmet from 'helmet';
import type { Config } from './config.ts';
import type { AppContext } from './context.ts';
import { ApiError, apiNotFound, errorHandler } from './http/errors.ts';
import { RATE_LIMIT_POOL_SETTING, RATE_LIMITS_SETTING, rateLimiter } from './http/rate-limit.ts';
import { mountRoutes } from './http/route.ts';
import { sessionMiddleware } from './http/session.ts';
import { allRoutes } from './routes.ts';
import type pg from 'pg';

export interface CreateAppOptions {
  ctx: AppContext;
  pool: pg.Pool;
  /** Serve the built client from dist/ (production start). */
  serveClient?: boolean;
  /** Extra middleware mounted after the API (the Vite dev server in `npm run dev`). */
  clientMiddleware?: RequestHandler;
}

/** Cross-site form posts are refused even before SameSite cookies are considered. */
function sameOriginWrites(config: Config): RequestHandler {
  const allowed = new URL(config.appOrigin).origin;
  return (req, _res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
    const origin = req.get('origin');
    if (origin && origin !== allowed) return next(new ApiError('forbidden', 'Requests from other sites are not accepted.'));
    if (!origin && req.get('sec-fetch-site') === 'cross-site') return next(new ApiError('forbidden', 'Requests from other sites are not accepted.'));
    next();
  };
}

export function createApp({ ctx, pool, serveClient = false, clientMiddleware }: CreateAppOptions): Express {
  const { config } = ctx;
  const app = express();
  app.disable('x-powered-by');
  // One reverse proxy in front: req.ip (audit entries, rate-limit keys) is the address it saw.
  if (config.trustProxy) app.set('trust proxy', 1);
  app.set(RATE_LIMITS_SETTING, config.rateLimits);
  app.set(RATE_LIMIT_POOL_SETTING, pool);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'img-src': ["'self'", 'data:', 'blob:'],
          'style-src': ["'self'", "'unsafe-inline'"],
          // The sign-in redirect leaves for the identity provider.
          'form-action': ["'self'", config.oidc.issuer],
          'upgrade-insecure-requests': config.appOrigin.startsWith('https://') ? [] : null,
          ...(clientMiddleware ? { 'script-src': ["'self'", "'unsafe-inline'"], 'connect-src': ["'self'", 'ws:'] } : {}),
        },
      },
      crossOriginEmbedderPolicy: false,
      hsts: config.appOrigin.startsWith('https://'),
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use(sameOriginWrites(config));
  api.use(
    '/auth',
    rateLimiter({ name: 'sign-in', windowMs: 60_000, limit: 60, message: 'Too many sign-in attempts. Wait a minute and try again.' }),
  );
  const sessions = sessionMiddleware(config, pool);
  const sessionless = new Set(allRoutes.filter((r) => r.sessionless).map((r) => r.path.replace(/^\/api/, '')));
  api.use((req, res, next) => (sessionless.has(req.path) ? next() : sessions(req, res, next)));
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  // Routes carry their full /api path so the OpenAPI document and the router agree.
  const routes = express.Router();
  mountRoutes(routes, allRoutes, ctx);
  app.use('/api', api);
  app.use(routes);
  app.use('/api', apiNotFound);
  app.use('/api', errorHandler(ctx.log));

  if (clientMiddleware) app.use(clientMiddleware);
  else if (serveClient) {
    const dist = path.join(config.root, 'dist');
    const index = path.join(dist, 'index.html');
    app.use(express.static(dist, { index: false, maxAge: '1h', immutable: false }));
    app.get(/^(?!\/api\/).*/, (_req, res) => {
      if (!existsSync(index)) {
        res.status(503).type('text').send('The client has not been built yet: run npm run build.');
        return;
      }
      res.set('Cache-Control', 'no-cache').sendFile(index);
    });
  }
  app.use(errorHandler(ctx.log));
  return app;
}
