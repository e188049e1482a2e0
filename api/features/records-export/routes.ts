import { IdParamsSchema } from '#shared/schemas/common.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { performerRecordsZip } from './service.ts';

export const recordsExportRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/records.zip',
    summary: "Everything Plinth holds on a performer, as a ZIP of JSON and the signed PDFs: for the performer, or handed over by the designated lead (logged as a read of health details)",
    tag: 'performers',
    auth: 'session',
    params: IdParamsSchema,
    produces: 'application/zip',
    errors: [403, 404],
    async handler({ ctx, actor, params, req, res }) {
      const zip = await performerRecordsZip(ctx, actor, params.id, req);
      res.type('application/zip').set('Content-Disposition', 'attachment; filename="my-plinth-records.zip"');
      zip.pipe(res);
      await new Promise<void>((resolve, reject) => {
        res.once('finish', resolve);
        zip.once('error', reject);
      });
    },
  }),
];
