import { IdParamsSchema } from '#shared/schemas/common.ts';
import { PieceChoiceListSchema, PieceChoiceQuerySchema, AskLeadInputSchema, CheckSchema, LeadDecisionInputSchema, LeadRequestListQuerySchema, LeadRequestListSchema, LeadRequestSchema, RunCheckInputSchema } from '#shared/schemas/checks.ts';
import { authorize } from '../../http/authorize.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { listPiecesOnHandFor } from '../builds/index.ts';
import { performerCardPdf, performerCardPng } from './card.ts';
import { askLead, decide, requestById, requestsFor, waitingChecks } from './request-service.ts';
import { checkById, runCheck } from './service.ts';

const TAG = 'checks';

export const checkRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/checks/pieces',
    summary: "Appliance pieces on the shelf made for this performer on this production, to add to a check (their materials are cleared with it)",
    tag: TAG,
    auth: 'session',
    query: PieceChoiceQuerySchema,
    response: PieceChoiceListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      authorize(actor, 'clearance.check', { productionId: query.productionId });
      return { items: await listPiecesOnHandFor(ctx.db, query.productionId, query.performerId) };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/checks/waiting',
    summary: 'Checks on a production with a question waiting on the designated lead (for the artists’ home)',
    tag: TAG,
    auth: 'session',
    query: LeadRequestListQuerySchema.pick({ productionId: true }),
    response: LeadRequestListSchema,
    errors: [403],
    handler: async ({ ctx, actor, query }) => ({ items: await waitingChecks(ctx, actor, query.productionId) }),
  }),
  defineRoute({
    method: 'post',
    path: '/api/checks',
    summary:
      "The artist's check before an application: the performer and the products planned (one by one, a kit, appliance pieces' materials), each answered Cleared, Caution, Do not use, Pending or Untested with reasons in plain words and validity, and one go or stop. One round trip; no grade, note or answer",
    tag: TAG,
    auth: 'session',
    body: RunCheckInputSchema,
    response: CheckSchema,
    status: 201,
    errors: [403, 404],
    handler: ({ ctx, actor, body, req }) => runCheck(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/checks/:id',
    summary: 'A check as it stands: its answers as they were given, with the lead’s answers to its requests as they come',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: CheckSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params }) => checkById(ctx, actor, params.id),
  }),
  defineRoute({
    method: 'post',
    path: '/api/checks/:id/requests',
    summary: 'Ask the designated lead about a Caution or Do not use product in this check (the lead is e-mailed a link, no health details)',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: AskLeadInputSchema,
    response: CheckSchema,
    status: 201,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => askLead(ctx, actor, params.id, body.formulationId, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/lead-requests',
    summary: "The artists' requests waiting on (or answered by) the designated lead of a production",
    tag: TAG,
    auth: 'session',
    query: LeadRequestListQuerySchema,
    response: LeadRequestListSchema,
    errors: [403],
    handler: async ({ ctx, actor, query }) => ({ items: await requestsFor(ctx, actor, query.productionId, query.status) }),
  }),
  defineRoute({
    method: 'get',
    path: '/api/lead-requests/:id',
    summary: 'One request to the lead; the lead’s note (health data) read and logged for the lead only',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: LeadRequestSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params, req }) => requestById(ctx, actor, params.id, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/lead-requests/:id/decision',
    summary: 'The lead approves or refuses a request, with a note for the health record (optimistic lock on version)',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: LeadDecisionInputSchema,
    response: LeadRequestSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => decide(ctx, actor, params.id, body, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/card.pdf',
    summary: "The performer's printable card (85.6 × 54 mm on A4): their name and a QR code that opens the check with them chosen; nothing medical",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    produces: 'application/pdf',
    errors: [403, 404],
    async handler({ ctx, actor, params, res }) {
      const pdf = await performerCardPdf(ctx, actor, params.id);
      res.set('Content-Type', 'application/pdf');
      res.set('Content-Disposition', 'inline; filename="plinth-performer-card.pdf"');
      res.send(pdf);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/card.png',
    summary: "The QR code of the performer's card as a PNG",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    produces: 'image/png',
    errors: [403, 404],
    async handler({ ctx, actor, params, res }) {
      const png = await performerCardPng(ctx, actor, params.id);
      res.set('Content-Type', 'image/png');
      res.set('Content-Disposition', 'inline; filename="plinth-performer-card.png"');
      res.send(png);
    },
  }),
];
