import { IdParamsSchema } from '#shared/schemas/common.ts';
import { CreateKitInputSchema, KitListQuerySchema, KitListSchema, KitSchema, UpdateKitInputSchema } from '#shared/schemas/kits.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { createKit, kitById, listKits, updateKit } from './service.ts';

const TAG = 'kits';

export const kitRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/kits',
    summary: "A production's kits (named lists of products used together), by name",
    tag: TAG,
    auth: 'session',
    query: KitListQuerySchema,
    response: KitListSchema,
    errors: [403],
    handler: ({ ctx, actor, query }) => listKits(ctx, actor, query.productionId),
  }),
  defineRoute({
    method: 'post',
    path: '/api/kits',
    summary: 'Make a kit: a name unique on the production and at least one catalogue product',
    tag: TAG,
    auth: 'session',
    body: CreateKitInputSchema,
    response: KitSchema,
    status: 201,
    errors: [403],
    handler: ({ ctx, actor, body, req }) => createKit(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/kits/:id',
    summary: 'One kit with its products in order',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: KitSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => kitById(ctx, actor, params.id),
  }),
  defineRoute({
    method: 'put',
    path: '/api/kits/:id',
    summary: 'Rename a kit or change its products (optimistic lock on version)',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: UpdateKitInputSchema,
    response: KitSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => updateKit(ctx, actor, params.id, body, req),
  }),
];
