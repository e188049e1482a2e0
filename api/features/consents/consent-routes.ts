import { z } from 'zod';
import { VERIFY_MAX_BYTES } from '#shared/limits.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  ConsentDetailSchema,
  ConsentListQuerySchema,
  ConsentListSchema,
  RequestWithdrawalLinkInputSchema,
  VerifyResultSchema,
  WithdrawalLinkRequestedSchema,
  WithdrawalLinkViewSchema,
  WithdrawInputSchema,
  WithdrawResultSchema,
} from '#shared/schemas/consents.ts';
import { afterResponse } from '../../http/after-response.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid } from '../../http/errors.ts';
import { rateLimiter } from '../../http/rate-limit.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { TOKEN_PATTERN } from '../../http/tokens.ts';
import { receiveFile } from '../../http/upload.ts';
import { staffCopyPdf } from './staff-copy.ts';
import { consentDetail, consentPdf, listVisibleConsents, sendWithdrawalLink, verifyPdf, withdrawAsActor, withdrawalLinkView, withdrawByLink } from './consent-service.ts';

const linkLimiter = rateLimiter({ name: 'consent-links', windowMs: 60_000, limit: 10, message: 'Too many attempts. Wait a minute and try again.' });
const TokenParams = z.object({ token: z.string().regex(TOKEN_PATTERN, 'Not a withdrawal link') });

export const consentRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/consents',
    summary: "A performer's signed consents (summaries: no answers)",
    tag: 'consents',
    auth: 'session',
    query: ConsentListQuerySchema,
    response: ConsentListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      if (!query.performerId) throw invalid({ performerId: ['Choose a performer'] });
      return { items: await listVisibleConsents(ctx, actor, query.performerId, query.state) };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/consents/:id',
    summary: 'One consent: text, answers (health answers only to the designated lead and the performer, audited)',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: ConsentDetailSchema,
    errors: [403, 404],
    handler: ({ ctx, actor, params, req }) => consentDetail(ctx, actor, params.id, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/consents/:id/pdf',
    summary: 'The signed PDF (it carries the answers, so health answers restrict it like the fields themselves)',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    produces: 'application/pdf',
    errors: [403, 404],
    async handler({ ctx, actor, params, req, res }) {
      const bytes = await consentPdf(ctx, actor, params.id, req);
      res.type('application/pdf').set('Content-Disposition', `inline; filename="consent-${params.id}.pdf"`).send(bytes);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/consents/:id/staff-pdf',
    summary: 'The staff-safe copy of a signed consent: the same record with every health answer withheld (for the head and production office)',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    produces: 'application/pdf',
    errors: [403, 404],
    async handler({ ctx, actor, params, req, res }) {
      const bytes = await staffCopyPdf(ctx, actor, params.id, req);
      res.type('application/pdf').set('Content-Disposition', `inline; filename="consent-${params.id}-staff-copy.pdf"`).send(bytes);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/consents/:id/withdraw',
    summary: 'Withdraw a consent (the performer, or the designated lead); not retroactive',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    body: WithdrawInputSchema,
    response: WithdrawResultSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => withdrawAsActor(ctx, actor, params.id, body, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/consents/verify',
    summary: 'Check a PDF against the consents Plinth issued, by its SHA-256',
    tag: 'consents',
    auth: 'session',
    multipart: true,
    response: VerifyResultSchema,
    errors: [403, 413],
    async handler({ ctx, actor, req, res }) {
      authorize(actor, 'consents.verify');
      // Read only once the permission check has passed.
      const file = await receiveFile(req, res, { field: 'file', maxBytes: VERIFY_MAX_BYTES });
      if (!file) throw invalid({ file: ['Choose a PDF to check'] });
      // An empty file or one that is no PDF at all is refused before anything is recorded; an altered PDF is answered.
      if (!file.buffer.subarray(0, 5).toString('latin1').startsWith('%PDF-')) throw invalid({ file: ['This file is not a PDF. Choose the PDF copy of the consent.'] });
      return verifyPdf(ctx, actor, file.buffer, req);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/withdrawal-links',
    summary: 'A performer without a sign-in asks for a link to withdraw consents; always answers the same',
    tag: 'signing',
    auth: 'public',
    body: RequestWithdrawalLinkInputSchema,
    response: WithdrawalLinkRequestedSchema,
    status: 202,
    before: [linkLimiter],
    errors: [429],
    async handler({ ctx, body, req, res }) {
      // The same reply, at once, whether or not the address is on file; the work happens after it.
      afterResponse(res, ctx.log, 'withdrawal link', () => sendWithdrawalLink(ctx, req, body.email));
      return { ok: true as const, message: 'If Plinth has consents for that address, a link to withdraw them is on its way. It works for 24 hours.' };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/withdrawal-links/:token',
    summary: "The performer's consents a withdrawal link shows, with what withdrawing each would mean",
    tag: 'signing',
    auth: 'public',
    params: TokenParams,
    response: WithdrawalLinkViewSchema,
    before: [linkLimiter],
    errors: [404, 409, 429],
    handler: ({ ctx, params }) => withdrawalLinkView(ctx, params.token),
  }),
  defineRoute({
    method: 'post',
    path: '/api/withdrawal-links/:token/withdraw',
    summary: 'Withdraw one consent through a withdrawal link',
    tag: 'signing',
    auth: 'public',
    params: TokenParams,
    body: z.object({ consentId: z.uuid(), reason: z.string().trim().max(1000).optional() }),
    response: z.object({ ok: z.literal(true) }),
    before: [linkLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, params, body, req }) {
      await withdrawByLink(ctx, params.token, body, req);
      return { ok: true as const };
    },
  }),
];
