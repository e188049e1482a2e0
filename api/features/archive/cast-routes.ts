import {
  CastDetailSchema,
  CastListQuerySchema,
  CastPageSchema,
  CastPhotoParamsSchema,
  ConditionCheckInputSchema,
  CreateCastInputSchema,
  MovementInputSchema,
  PeopleSchema,
  PhotoFileQuerySchema,
  PhotoSchema,
  PhotoUploadQuerySchema,
  UpdateCastInputSchema,
} from '#shared/schemas/archive.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { castDetail, castPeople, createCast, recordConditionCheck, updateCast } from './cast-service.ts';
import { recordMovement } from './movement-service.ts';
import { addPhoto, removePhoto, sendPhoto } from './photo-service.ts';
import { findCasts } from './search-service.ts';

const TAG = 'archive';

export const castRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/casts',
    summary:
      'Find casts you may see: q is one search box (performer name, closely spelt; production; region; kind; a place code such as R2; a code path such as GH/NORTH/R1; a label code or a scanned label URL), with filters, sort and server paging',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    query: CastListQuerySchema,
    response: CastPageSchema,
    errors: [403],
    handler: ({ ctx, actor, query }) => findCasts(ctx.db, actor, query, ctx.config.appOrigin),
  }),
  defineRoute({
    method: 'post',
    path: '/api/casts',
    summary: 'Record a cast on its shelf or bin (its normal home); you must be an archivist of its production or of one its performer is engaged on',
    tag: TAG,
    auth: 'session',
    body: CreateCastInputSchema,
    response: CastDetailSchema,
    status: 201,
    errors: [403],
    async handler({ ctx, actor, body, req }) {
      const id = await createCast(ctx.db, actor, body, req);
      return castDetail(ctx, actor, id);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/casts/:id',
    summary: 'One cast: what it is, where it is now and normally, its whole movement history, condition checks, photos, related casts and retention',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: CastDetailSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => castDetail(ctx, actor, params.id),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/casts/:id',
    summary: 'Correct what a cast is (optimistic lock on version); where it is changes only through movements',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: UpdateCastInputSchema,
    response: CastDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await updateCast(ctx.db, actor, params.id, body, req);
      return castDetail(ctx, actor, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/casts/:id/movements',
    summary:
      'Record a move (check-out, check-in, relocation, loan, return to performer, destruction) with mover and authoriser, based on the cast version you saw; refused with the reason when the cast’s status does not allow it, and a destruction needs a reason and a witness other than the mover',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: MovementInputSchema,
    response: CastDetailSchema,
    status: 201,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await recordMovement(ctx.db, actor, params.id, body, req);
      return castDetail(ctx, actor, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/casts/:id/condition-checks',
    summary: 'Record a condition check (date, who checked, grade, notes); poor and damaged say what is wrong. Photos are added with the photo upload and its conditionCheckId',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: ConditionCheckInputSchema,
    response: CastDetailSchema,
    status: 201,
    errors: [403, 404],
    async handler({ ctx, actor, params, body, req }) {
      await recordConditionCheck(ctx.db, actor, params.id, body, req);
      return castDetail(ctx, actor, params.id);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/casts/:id/people',
    summary: 'Staff of the cast’s productions, to name as the person taking it, authorising a move or witnessing one',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: PeopleSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => castPeople(ctx.db, actor, params.id),
  }),
  defineRoute({
    method: 'post',
    path: '/api/casts/:id/photos',
    summary:
      'Add one photo (multipart field "photo", at most 10 MB and 100 megapixels; JPEG, PNG, WebP or AVIF, read from the content) to the cast, or to one of its condition checks. Stored upright as a JPEG without metadata, with a 256×256 thumbnail',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    query: PhotoUploadQuerySchema,
    multipart: true,
    response: PhotoSchema,
    status: 201,
    errors: [403, 404, 413],
    handler: ({ ctx, actor, params, query, req, res }) => addPhoto(ctx, actor, params.id, query.conditionCheckId, req, res),
  }),
  defineRoute({
    method: 'get',
    path: '/api/casts/:id/photos/:photoId',
    summary: 'A photo of a cast (JPEG, at most 1600 px) for those who may see the cast and for its performer; ?v=<file id> makes it cacheable',
    tag: TAG,
    auth: 'session',
    params: CastPhotoParamsSchema,
    query: PhotoFileQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    handler: ({ ctx, actor, params, query, res }) => sendPhoto(ctx, actor, params.id, params.photoId, 'photo', query.v, res),
  }),
  defineRoute({
    method: 'get',
    path: '/api/casts/:id/photos/:photoId/thumbnail',
    summary: 'The 256×256 thumbnail of a cast photo, for the same people',
    tag: TAG,
    auth: 'session',
    params: CastPhotoParamsSchema,
    query: PhotoFileQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    handler: ({ ctx, actor, params, query, res }) => sendPhoto(ctx, actor, params.id, params.photoId, 'thumbnail', query.v, res),
  }),
  defineRoute({
    method: 'delete',
    path: '/api/casts/:id/photos/:photoId',
    summary: 'Remove a photo; its files are deleted',
    tag: TAG,
    auth: 'session',
    params: CastPhotoParamsSchema,
    status: 204,
    errors: [403, 404],
    handler: ({ ctx, actor, params, req }) => removePhoto(ctx, actor, params.id, params.photoId, req),
  }),
];
