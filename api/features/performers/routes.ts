import type { Request, Response } from 'express';
import { z } from 'zod';
import type { Actor } from '#shared/policy.ts';
import { can } from '#shared/policy.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  CreatePerformerInputSchema,
  CsvImportQuerySchema,
  CsvImportResultSchema,
  LinkAccountInputSchema,
  PerformerDetailSchema,
  type PerformerListQuery,
  PerformerListQuerySchema,
  PerformerPageSchema,
  UpdatePerformerInputSchema,
} from '#shared/schemas/performers.ts';
import type { AppContext } from '../../context.ts';
import { afterResponse } from '../../http/after-response.ts';
import { recordEvent } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid } from '../../http/errors.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { receiveFile } from '../../http/upload.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { IMPORT_MAX_BYTES, performersCsv } from './csv.ts';
import { commitImport, previewImport } from './import-service.ts';
import { listPerformers, listPerformersForExport } from './list-repo.ts';
import { PORTRAIT_MAX_BYTES } from './portrait.ts';
import { assertMayManage, createPerformer, listScope, performerDetail, portraitFile, removePortrait, setPortrait, unlinkAccount, updatePerformer } from './service.ts';

const TAG = 'performers';

async function receiveFileOr400(req: Request, res: Response, field: string, maxBytes: number, missing: string) {
  const file = await receiveFile(req, res, { field, maxBytes });
  if (!file) throw invalid({ [field]: [missing] });
  return file;
}

const PortraitQuerySchema = z.object({ v: z.string().max(100).optional() });

async function sendPortrait(ctx: AppContext, actor: Actor, id: string, which: 'portrait' | 'thumbnail', v: string | undefined, res: Response) {
  const { fileId, file } = await portraitFile(ctx, actor, id, which);
  // The URL carries the file id, so a matching ?v= names bytes that never change; private: it is a person's face.
  res.set('Cache-Control', v === fileId ? 'private, max-age=86400, immutable' : 'private, no-cache');
  res.set('ETag', `"${file.sha256}"`);
  res.type(file.contentType).send(file.bytes);
}

/** The registry as filtered, as CSV; contact columns only where the actor manages every production covered. */
async function exportPerformers(ctx: AppContext, actor: Actor, query: Omit<PerformerListQuery, 'page' | 'pageSize'>, req: Request): Promise<string> {
  const scope = listScope(actor, query.productionId);
  const includeContact = scope.productionIds.every((productionId) => can(actor, 'performers.manage', { productionId }));
  const rows = await listPerformersForExport(ctx.db, query, { productionIds: scope.productionIds });
  await recordEvent(ctx.db, {
    actorUserId: actor.userId,
    action: 'performer.export',
    entityType: 'performer',
    productionId: query.productionId ?? null,
    req,
    details: { rows: rows.length, contact: includeContact, q: query.q ?? null, consent: query.consent },
  });
  return performersCsv(rows, { includeContact, productionId: query.productionId, showsProduction: (p) => scope.viewable.has(p) });
}

export const performerRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/performers',
    summary: 'The performer registry: performers engaged on productions where you may view performers (search, consent filter, sort, page)',
    tag: TAG,
    auth: 'session',
    query: PerformerListQuerySchema,
    response: PerformerPageSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      const scope = listScope(actor, query.productionId);
      const { items, total } = await listPerformers(ctx.db, query, { productionIds: scope.productionIds, showsProduction: (p) => scope.viewable.has(p) });
      return { items, total, page: query.page, pageSize: query.pageSize };
    },
  }),
  // Before /api/performers/:id, so "export.csv" is never taken for an id.
  defineRoute({
    method: 'get',
    path: '/api/performers/export.csv',
    summary:
      'The registry as filtered, as CSV (no paging). Contact columns are left out unless you manage performers on every production the export covers',
    tag: TAG,
    auth: 'session',
    query: PerformerListQuerySchema.omit({ page: true, pageSize: true }),
    produces: 'text/csv',
    errors: [403],
    async handler({ ctx, actor, query, req, res }) {
      const csv = await exportPerformers(ctx, actor, query, req);
      res.set('Content-Type', 'text/csv; charset=utf-8');
      res.set('Content-Disposition', 'attachment; filename="performers.csv"');
      res.send(csv);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/performers/import',
    summary:
      'Import performers from CSV (multipart field "file", UTF-8, at most 2 MB and 2,000 rows) onto a production you manage. ' +
      'commit=false previews: 200 with every row checked and nothing written, problems included. ' +
      'commit=true checks again and writes everything in one transaction, or, if anything is wrong, nothing: a 400 whose details.result holds the same report',
    tag: TAG,
    auth: 'session',
    multipart: true,
    query: CsvImportQuerySchema,
    response: CsvImportResultSchema,
    errors: [403, 413],
    async handler({ ctx, actor, query, req, res }) {
      // Permission checked here, before a byte of the upload is read.
      authorize(actor, 'performers.manage', { productionId: query.productionId });
      const file = await receiveFileOr400(req, res, 'file', IMPORT_MAX_BYTES, 'Choose a CSV file to import.');
      if (!query.commit) return previewImport(ctx, actor, file.buffer, query.productionId);
      const { result, mails } = await commitImport(ctx, actor, file.buffer, query.productionId, req);
      // Possibly thousands of messages: sent after the reply, so the import answers at once.
      afterResponse(res, ctx.log, 'import confirmation requests', async () => void (await deliverAll(ctx, mails)));
      return result;
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id',
    summary: 'One performer: contact details only for those who manage them and for the performer; never any health details',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: PerformerDetailSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => performerDetail(ctx, actor, params.id),
  }),
  defineRoute({
    method: 'post',
    path: '/api/performers',
    summary: 'Register a performer, engaged on one or more productions; you must manage performers on every one of them',
    tag: TAG,
    auth: 'session',
    body: CreatePerformerInputSchema,
    response: PerformerDetailSchema,
    status: 201,
    errors: [403],
    handler: ({ ctx, actor, body, req }) => createPerformer(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/performers/:id',
    summary:
      "Edit a performer (optimistic lock on version). Engagements in the body replace the performer's engagements on productions you manage; those on other productions are kept as they are",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: UpdatePerformerInputSchema,
    response: PerformerDetailSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => updatePerformer(ctx, actor, params.id, body, req),
  }),
  defineRoute({
    method: 'put',
    path: '/api/performers/:id/account',
    summary:
      "Unlink the performer's sign-in (userId null); its performer role goes on the productions you manage (every one, for the studio administrator). " +
      'Linking is the performer\'s own act (an invitation they accept, or signing in with the address they confirmed), never a staff action',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: LinkAccountInputSchema,
    response: PerformerDetailSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => unlinkAccount(ctx, actor, params.id, body.version, req),
  }),
  defineRoute({
    method: 'put',
    path: '/api/performers/:id/portrait',
    summary:
      'Upload a portrait (multipart field "portrait", at most 10 MB; JPEG, PNG, WebP or AVIF, read from the content). Stored upright as a JPEG without any metadata, with a 256×256 thumbnail',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    multipart: true,
    response: PerformerDetailSchema,
    errors: [403, 404, 413],
    async handler({ ctx, actor, params, req, res }) {
      // Permission checked here, before a byte of the upload is read.
      await assertMayManage(ctx, actor, params.id);
      const file = await receiveFileOr400(req, res, 'portrait', PORTRAIT_MAX_BYTES, 'Choose a photo to upload.');
      return setPortrait(ctx, actor, params.id, file.buffer, req);
    },
  }),
  defineRoute({
    method: 'delete',
    path: '/api/performers/:id/portrait',
    summary: 'Remove the portrait (and its thumbnail); their files are deleted',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    status: 204,
    errors: [403, 404],
    async handler({ ctx, actor, params, req }) {
      await assertMayManage(ctx, actor, params.id);
      await removePortrait(ctx, actor, params.id, req);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/portrait',
    summary: 'The portrait (JPEG, at most 1600 px) for anyone who may see the performer; ?v=<file id> makes it cacheable',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    query: PortraitQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    handler: ({ ctx, actor, params, query, res }) => sendPortrait(ctx, actor, params.id, 'portrait', query.v, res),
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/portrait/thumbnail',
    summary: 'The 256×256 portrait thumbnail for anyone who may see the performer; ?v=<file id> makes it cacheable',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    query: PortraitQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    handler: ({ ctx, actor, params, query, res }) => sendPortrait(ctx, actor, params.id, 'thumbnail', query.v, res),
  }),
];
