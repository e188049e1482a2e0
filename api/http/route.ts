import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import express, { type NextFunction, type Request, type Response, type Router } from 'express';
import { z } from 'zod';
import { ErrorBodySchema } from '#shared/errors.ts';
import type { Action, Actor } from '#shared/policy.ts';
import type { AppContext } from '../context.ts';
import { ApiError, invalid, unauthenticated } from './errors.ts';
import { fieldErrorsFromIssues } from '#shared/errors.ts';
import { controlCharFields } from '#shared/schemas/common.ts';
import { authorize } from './authorize.ts';
import { sessionActor } from './session.ts';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface HandlerInput<P, Q, B, A extends Actor | null> {
  req: Request;
  res: Response;
  ctx: AppContext;
  params: P;
  query: Q;
  body: B;
  actor: A;
}

export interface RouteSpec<P = unknown, Q = unknown, B = unknown, R = unknown, Auth extends 'public' | 'session' = 'session'> {
  method: Method;
  /** Express-style path ("/api/users/:id"). */
  path: string;
  summary: string;
  tag: string;
  auth: Auth;
  /**
   * A public route that never asks who is calling (the load balancer's liveness check): no session
   * is read or touched for it, so polling it costs the database only what the route itself asks.
   */
  sessionless?: Auth extends 'public' ? boolean : never;
  /**
   * A studio-wide permission checked before any input is read, so a person without it learns
   * nothing from validation messages. Production-scoped checks happen in the handler, once the
   * record (and so its production) is loaded.
   */
  requires?: Action;
  params?: z.ZodType<P>;
  query?: z.ZodType<Q>;
  body?: z.ZodType<B>;
  /** A multipart upload: the handler reads req.file(s); `body` then describes the text fields. */
  multipart?: boolean;
  response?: z.ZodType<R>;
  /** Success status; 204 sends no body. */
  status?: 200 | 201 | 202 | 204 | 302;
  /** For routes that answer with something other than JSON (a file, a redirect, a page). */
  produces?: string;
  /** Errors this route can answer with, besides 400/401/500, for the documentation. */
  errors?: number[];
  /** Middleware run before parsing (e.g. the upload parser, a rate limiter). */
  before?: express.RequestHandler[];
  handler: (input: HandlerInput<P, Q, B, Auth extends 'session' ? Actor : Actor | null>) => Promise<R | undefined | void>;
}

// Specs are stored with their types erased; defineRoute keeps them checked where written.
export type AnyRoute = RouteSpec<any, any, any, any, 'public' | 'session'>;

export function defineRoute<P = unknown, Q = unknown, B = unknown, R = unknown, Auth extends 'public' | 'session' = 'session'>(
  spec: RouteSpec<P, Q, B, R, Auth>,
): AnyRoute {
  return spec as unknown as AnyRoute;
}

function parseOr400<T>(schema: z.ZodType<T> | undefined, value: unknown, where: string): T {
  if (!schema) return undefined as T;
  const r = schema.safeParse(value ?? {});
  if (!r.success) {
    const fields = fieldErrorsFromIssues(r.error.issues);
    throw invalid(fields, where === 'body' ? 'Some fields need attention.' : `The ${where} is not valid.`);
  }
  return r.data;
}

/** Input guard for every route: a NUL or other control character never reaches a schema or PostgreSQL. */
function refuseControlChars(req: Request): void {
  const fields = {
    ...controlCharFields(req.params),
    ...controlCharFields(req.query),
    ...(req.body && typeof req.body === 'object' ? controlCharFields(req.body) : {}),
  };
  if (Object.keys(fields).length) throw invalid(fields, 'Some text holds control characters, which Plinth does not accept.');
}

/** Mounts routes on a router: input parsed here (trust boundary), session checked, reply shaped by its schema. */
export function mountRoutes(router: Router, routes: readonly AnyRoute[], ctx: AppContext): void {
  for (const route of routes) {
    const handlers: express.RequestHandler[] = [...(route.before ?? [])];
    handlers.push(async (req: Request, res: Response, next: NextFunction) => {
      try {
        const actor = route.sessionless ? null : await sessionActor(req, ctx.db, ctx.config.sessionMaxMs);
        if (route.auth === 'session' && !actor) {
          if (req.session?.tablet) {
            throw new ApiError('unauthenticated', 'This tablet is lent to a performer for signing. Staff must sign in again.', { tablet: req.session.tablet.phase });
          }
          throw unauthenticated();
        }
        if (route.requires) authorize(actor as Actor, route.requires);
        refuseControlChars(req);
        const params = parseOr400(route.params, req.params, 'path');
        const query = parseOr400(route.query, req.query, 'query');
        const body = parseOr400(route.body, req.body, 'body');
        const result = await route.handler({ req, res, ctx, params, query, body, actor: actor as Actor });
        if (res.headersSent) return;
        const status = route.status ?? 200;
        if (status === 204) {
          res.status(204).end();
          return;
        }
        // Only what the response schema declares leaves the server.
        const payload = route.response ? route.response.parse(result) : result;
        res.status(status).json(payload);
      } catch (err) {
        next(err);
      }
    });
    router[route.method](route.path, ...handlers);
  }
}

const STATUS_TEXT: Record<number, string> = {
  400: 'Invalid input; details.fields names each bad field',
  401: 'Not signed in',
  403: 'Signed in, but not allowed',
  404: 'Not found',
  409: 'Conflict: stale version or duplicate',
  413: 'Upload or body too large',
  429: 'Too many requests',
  500: 'Unexpected server error (no stack trace is sent)',
  503: 'The database is unreachable',
};

/** Builds an OpenAPI 3.1 document from the same route specs and zod schemas the server runs. */
export function buildOpenApi(routes: readonly AnyRoute[], info: { title: string; version: string }) {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', { type: 'apiKey', in: 'cookie', name: 'plinth.sid' });
  for (const route of routes) {
    const errors = new Set([400, 500, ...(route.auth === 'session' ? [401] : []), ...(route.errors ?? [])]);
    const responses: Record<string, { description: string; content?: Record<string, { schema: z.ZodType }> }> = {};
    const ok = route.status ?? 200;
    if (ok === 204 || ok === 302) responses[String(ok)] = { description: ok === 204 ? 'Done' : 'Redirect' };
    else if (route.produces) responses[String(ok)] = { description: 'OK', content: { [route.produces]: { schema: z.string() } } };
    else responses[String(ok)] = { description: 'OK', content: { 'application/json': { schema: route.response ?? z.unknown() } } };
    for (const s of errors) {
      responses[String(s)] = { description: STATUS_TEXT[s] ?? 'Error', content: { 'application/json': { schema: ErrorBodySchema } } };
    }
    const bodyContentType = route.multipart ? 'multipart/form-data' : 'application/json';
    registry.registerPath({
      method: route.method,
      path: route.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}'),
      summary: route.summary,
      tags: [route.tag],
      ...(route.auth === 'session' ? { security: [{ session: [] }] } : {}),
      ...(route.requires ? { 'x-permission': route.requires } : {}),
      request: {
        ...(route.params ? { params: route.params as z.ZodObject } : {}),
        ...(route.query ? { query: route.query as z.ZodObject } : {}),
        ...(route.body || route.multipart
          ? { body: { content: { [bodyContentType]: { schema: route.body ?? z.object({}) } } } }
          : {}),
      },
      responses,
    });
  }
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: { ...info, description: 'Plinth API. Every error has the shape { error: { code, message, details? } }.' },
    servers: [{ url: '/' }],
  });
}

export { ApiError };
