import { LabelParamsSchema, LabelSheetQuerySchema, LabelTargetSchema, PerformerCastsSchema, RetentionListSchema } from '#shared/schemas/archive.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { performerCasts } from './cast-service.ts';
import { labelSheet, resolveLabel } from './label-service.ts';
import { retentionList } from './retention.ts';

const TAG = 'archive';

export const archiveRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/archive/labels.pdf',
    summary: 'A printable A4 sheet of QR labels (3 × 7 per page) for the chosen casts and places (?casts=id,id&locations=id,id, at most 200); each QR holds the address that opens it, with its label code printed beside',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    query: LabelSheetQuerySchema,
    produces: 'application/pdf',
    errors: [403],
    async handler({ ctx, actor, query, req, res }) {
      const pdf = await labelSheet(ctx, actor, { casts: query.casts, locations: query.locations }, req);
      res.set('Content-Type', 'application/pdf');
      res.set('Content-Disposition', 'inline; filename="plinth-labels.pdf"');
      res.send(pdf);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/archive/labels/:code',
    summary: 'What a label code (typed, or read from a scanned label) opens: a cast or a place; 400 for a misread code, 404 for one that was never printed',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    params: LabelParamsSchema,
    response: LabelTargetSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => resolveLabel(ctx, actor, params.code),
  }),
  defineRoute({
    method: 'get',
    path: '/api/archive/retention',
    summary: 'Casts you may see that are due for return or destruction (review date passed, storage consent withdrawn or none on file), and those due for review soon',
    tag: TAG,
    auth: 'session',
    requires: 'archive.view',
    response: RetentionListSchema,
    errors: [403],
    handler: ({ ctx, actor }) => retentionList(ctx.db, actor),
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/casts',
    summary: "A performer's life casts: staff who may see the performer's casts get the archive's lines; the performer sees their own and where each is kept",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: PerformerCastsSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => performerCasts(ctx.db, actor, params.id),
  }),
];
