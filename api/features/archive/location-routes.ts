import { CreateLocationInputSchema, DeleteLocationQuerySchema, LocationDetailSchema, LocationTreeSchema, UpdateLocationInputSchema } from '#shared/schemas/archive.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { createLocation, deleteLocation, locationDetail, locationTree, updateLocation } from './location-service.ts';

const TAG = 'archive';

export const locationRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/archive/locations',
    summary: 'The storage tree (site, room, rack, shelf, bin) with codes, code paths, environment notes and how many casts you may see sit in each place',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    response: LocationTreeSchema,
    handler: ({ ctx, actor }) => locationTree(ctx.db, actor),
  }),
  defineRoute({
    method: 'post',
    path: '/api/archive/locations',
    summary: 'Add a storage place under a parent of the right level (a room in a site, a shelf in a rack…); its short code is unique among its siblings and it gets its own label code',
    tag: TAG,
    auth: 'session',
    requires: 'locations.manage',
    body: CreateLocationInputSchema,
    response: LocationDetailSchema,
    status: 201,
    errors: [403],
    async handler({ ctx, actor, body, req }) {
      const id = await createLocation(ctx.db, actor, body, req);
      return locationDetail(ctx.db, actor, id);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/archive/locations/:id',
    summary: 'One place: where it sits, the places inside it, the casts on it or below it that you may see, and the casts that belong here but are out',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    params: IdParamsSchema,
    response: LocationDetailSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => locationDetail(ctx.db, actor, params.id),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/archive/locations/:id',
    summary: 'Rename, re-code, note the environment of, or move a place within the tree (optimistic lock on version); a place never goes inside itself or one of the places it holds',
    tag: TAG,
    auth: 'session',
    requires: 'locations.manage',
    params: IdParamsSchema,
    body: UpdateLocationInputSchema,
    response: LocationDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await updateLocation(ctx.db, actor, params.id, body, req);
      return locationDetail(ctx.db, actor, params.id);
    },
  }),
  defineRoute({
    method: 'delete',
    path: '/api/archive/locations/:id',
    summary: 'Remove an empty place (?version=): 409 while it holds places or casts, or casts call it home',
    tag: TAG,
    auth: 'session',
    requires: 'locations.manage',
    params: IdParamsSchema,
    query: DeleteLocationQuerySchema,
    status: 204,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, query, req }) {
      await deleteLocation(ctx.db, actor, params.id, query.version, req);
    },
  }),
];
