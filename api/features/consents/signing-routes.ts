import { randomUUID } from 'node:crypto';
import type { Request } from 'express';
import { sql } from 'kysely';
import { z } from 'zod';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  CreateSigningRequestInputSchema,
  SigningFormSchema,
  SigningRequestListSchema,
  SigningRequestSchema,
  type SigningRequest,
  SubmitSignatureInputSchema,
  SubmitSignatureResultSchema,
  HandOverResultSchema,
  TabletStateSchema,
} from '#shared/schemas/consents.ts';
import { client } from '../../auth/oidc-client.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { ApiError, conflict, invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { rateLimiter } from '../../http/rate-limit.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { findCurrentTemplateVersion, performerScope } from './repo.ts';
import { submitSignature, type OpenRequest } from './service.ts';

const TABLET_REQUEST_HOURS = 2;
const LINK_REQUEST_DAYS = 7;

const TokenParamsSchema = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{40,60}$/, 'Not a signing link') });

function requestQuery(db: Db) {
  return db
    .selectFrom('signing_requests as r')
    .innerJoin('performers as p', 'p.id', 'r.performer_id')
    .innerJoin('consent_templates as t', 't.id', 'r.template_id')
    .innerJoin('consent_template_versions as v', (j) => j.onRef('v.template_id', '=', 't.id').onRef('v.version', '=', 't.current_version'))
    .select([
      'r.id',
      'r.mode',
      'r.status',
      'r.expires_at',
      'r.created_at',
      'r.performer_id',
      'r.production_id',
      'r.template_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'p.email',
      'v.title',
      't.kind',
    ]);
}
type RequestRow = Awaited<ReturnType<ReturnType<typeof requestQuery>['executeTakeFirstOrThrow']>>;

function toSigningRequest(r: RequestRow): SigningRequest {
  const expired = r.status === 'open' && new Date(r.expires_at).getTime() <= Date.now();
  return {
    id: r.id,
    mode: r.mode,
    status: expired ? 'expired' : r.status,
    expiresAt: new Date(r.expires_at).toISOString(),
    createdAt: new Date(r.created_at).toISOString(),
    performer: { id: r.performer_id, name: r.performer_name },
    template: { id: r.template_id, title: r.title, kind: r.kind },
    sentTo: r.mode === 'link' ? r.email : null,
  };
}

function asOpenRequest(r: { id: string; performer_id: string; production_id: string | null; template_id: string; status: 'open' | 'signed' | 'cancelled'; expires_at: Date | string }): OpenRequest {
  return { id: r.id, performerId: r.performer_id, productionId: r.production_id, templateId: r.template_id, status: r.status, expiresAt: new Date(r.expires_at) };
}

/** The exact current text of the requested form, frozen for this viewing by its version id. */
async function signingForm(ctx: AppContext, r: RequestRow) {
  const template = await findCurrentTemplateVersion(ctx.db, r.template_id);
  if (!template) throw notFound('The form');
  const production = r.production_id ? await ctx.db.selectFrom('productions').select('name').where('id', '=', r.production_id).executeTakeFirst() : undefined;
  return {
    requestId: r.id,
    performerName: r.performer_name,
    productionName: production?.name ?? null,
    expiresAt: new Date(r.expires_at).toISOString(),
    template: { versionId: template.versionId, version: template.version, kind: template.kind, title: template.title, body: template.body, questions: template.questions, validityDays: template.validityDays },
  };
}

async function requestByToken(ctx: AppContext, token: string): Promise<RequestRow> {
  const r = await requestQuery(ctx.db).where('r.token_hash', '=', hashToken(token)).where('r.mode', '=', 'link').executeTakeFirst();
  if (!r) throw notFound('This signing link');
  if (r.status === 'cancelled') throw new ApiError('not_found', 'This signing link was withdrawn by the department.', { reason: 'cancelled' });
  if (r.status === 'signed') throw conflict('This form has already been signed through this link. Each link works once.', { reason: 'signed' });
  if (new Date(r.expires_at).getTime() <= Date.now()) throw conflict('This signing link has expired. Ask the department to send a new one.', { reason: 'expired' });
  return r;
}

const publicLimiter = rateLimiter({ windowMs: 60_000, limit: 30, message: 'Too many attempts. Wait a minute and try again.' });

function clientMeta(req: Request) {
  return { ip: req.ip ?? null, userAgent: req.get('user-agent')?.slice(0, 400) ?? null };
}

export const signingRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/signing-requests',
    summary: 'Signing requests for a production (optionally one performer)',
    tag: 'consents',
    auth: 'session',
    query: z.object({ productionId: z.uuid(), performerId: z.uuid().optional(), status: z.enum(['open', 'signed', 'cancelled']).optional() }),
    response: SigningRequestListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      authorize(actor, 'consents.request', { productionId: query.productionId });
      let q = requestQuery(ctx.db).where('r.production_id', '=', query.productionId);
      if (query.performerId) q = q.where('r.performer_id', '=', query.performerId);
      if (query.status) q = q.where('r.status', '=', query.status);
      return { items: (await q.orderBy('r.created_at', 'desc').limit(200).execute()).map(toSigningRequest) };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing-requests',
    summary: 'Ask a performer to sign a form: on this tablet, or by a one-time link e-mailed to them',
    tag: 'consents',
    auth: 'session',
    body: CreateSigningRequestInputSchema,
    response: SigningRequestSchema,
    status: 201,
    errors: [403, 404],
    async handler({ ctx, actor, body, req }) {
      authorize(actor, 'consents.request', { productionId: body.productionId });
      const performer = await performerScope(ctx.db, body.performerId);
      if (!performer || !performer.productionIds.includes(body.productionId)) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
      const template = await ctx.db.selectFrom('consent_templates').select(['id', 'archived']).where('id', '=', body.templateId).executeTakeFirst();
      if (!template || template.archived) throw invalid({ templateId: ['Choose a current form.'] });
      if (body.mode === 'link' && !performer.email) {
        throw invalid({
          mode: [
            performer.emailUnconfirmed
              ? 'The performer has not yet confirmed their e-mail address, so no signing link can go to it. Sign on the tablet, or ask them to confirm it first.'
              : 'This performer has no e-mail address on record. Add one, or sign on the tablet.',
          ],
        });
      }
      const token = body.mode === 'link' ? newToken() : null;
      const expiresAt = new Date(Date.now() + (body.mode === 'link' ? LINK_REQUEST_DAYS * 86_400_000 : TABLET_REQUEST_HOURS * 3_600_000));
      const id = await ctx.db.transaction().execute(async (trx) => {
        const r = await trx
          .insertInto('signing_requests')
          .values({ performer_id: body.performerId, production_id: body.productionId, template_id: body.templateId, mode: body.mode, token_hash: token ? hashToken(token) : null, expires_at: expiresAt, created_by: actor.userId })
          .returning('id')
          .executeTakeFirstOrThrow();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'signing_request.create', entityType: 'signing_request', entityId: r.id, productionId: body.productionId, req, details: { performerId: body.performerId, mode: body.mode } });
        return r.id;
      });
      const row = await requestQuery(ctx.db).where('r.id', '=', id).executeTakeFirstOrThrow();
      if (token && performer.email) {
        const link = `${ctx.config.appOrigin}/sign/${token}`;
        try {
          await ctx.mailer.send({
            to: performer.email,
            subject: `Please read and sign: ${row.title}`,
            text: [
              `Hello ${performer.name},`,
              '',
              `The make-up department asks you to read and, if you agree, sign this ${CONSENT_KIND_LABELS[row.kind].toLowerCase()} form:`,
              '',
              link,
              '',
              `The link works once and until ${expiresAt.toUTCString()}. You are free not to sign; ask the department if anything is unclear.`,
            ].join('\n'),
          });
        } catch (err) {
          ctx.log('signing link e-mail not sent', err);
          throw new ApiError('unavailable', 'The request was saved, but the e-mail could not be sent. Try sending it again in a moment.');
        }
      }
      return toSigningRequest(row);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing-requests/:id/cancel',
    summary: 'Cancel an open signing request (its link stops working)',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: SigningRequestSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, req }) {
      const r = await requestQuery(ctx.db).where('r.id', '=', params.id).executeTakeFirst();
      if (!r) throw notFound('That signing request');
      authorize(actor, 'consents.request', { productionId: r.production_id });
      if (r.status !== 'open') throw conflict('Only an open request can be cancelled.');
      await ctx.db.transaction().execute(async (trx) => {
        // Only while still open: a signing that lands first wins over a racing cancel.
        const done = await trx.updateTable('signing_requests').set({ status: 'cancelled' }).where('id', '=', params.id).where('status', '=', 'open').executeTakeFirst();
        if (Number(done.numUpdatedRows) !== 1) throw conflict('Only an open request can be cancelled.');
        await writeAudit(trx, { actorUserId: actor.userId, action: 'signing_request.cancel', entityType: 'signing_request', entityId: params.id, productionId: r.production_id, req });
      });
      return toSigningRequest({ ...r, status: 'cancelled' });
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing-requests/:id/hand-over',
    summary:
      'Lend this browser to the performer: the session is locked to this one form until staff sign in again. The reply names where to go next: through the identity provider\'s sign-out (so no remembered sign-in survives on the tablet) and back to the form',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: HandOverResultSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, req }) {
      const r = await requestQuery(ctx.db).where('r.id', '=', params.id).executeTakeFirst();
      if (!r) throw notFound('That signing request');
      authorize(actor, 'consents.request', { productionId: r.production_id });
      if (r.mode !== 'tablet') throw invalid({ id: ['This request was sent as a link; it cannot be signed on the tablet.'] });
      if (r.status !== 'open' || new Date(r.expires_at).getTime() <= Date.now()) throw conflict('This request is no longer open.');
      await writeAudit(ctx.db, { actorUserId: actor.userId, action: 'tablet.hand_over', entityType: 'signing_request', entityId: r.id, productionId: r.production_id, req });
      // End the staff member's sign-in at the identity provider too, so nobody can walk back in on the tablet.
      let redirectTo = '/tablet';
      try {
        const configuration = await ctx.oidc.configuration();
        if (configuration.serverMetadata().end_session_endpoint) {
          redirectTo = client.buildEndSessionUrl(configuration, {
            post_logout_redirect_uri: ctx.config.oidc.postLogoutRedirectUri,
            ...(req.session.idToken ? { id_token_hint: req.session.idToken } : { client_id: ctx.config.oidc.clientId }),
          }).href;
        }
      } catch {
        // The lock below holds either way; leaving it still needs a forced sign-in.
      }
      // The staff member's access leaves the session now; only the signing routes answer it.
      delete req.session.userId;
      delete req.session.idToken;
      req.session.tablet = { requestId: r.id, staffUserId: actor.userId, phase: 'signing', idempotencyKey: randomUUID() };
      await ctx.db.updateTable('signing_requests').set({ opened_at: new Date() }).where('id', '=', r.id).execute();
      return { ok: true as const, redirectTo };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/tablet',
    summary: 'What the lent tablet shows: the form while signing, nothing once done',
    tag: 'signing',
    auth: 'public',
    response: TabletStateSchema,
    async handler({ ctx, req }) {
      const t = req.session?.tablet;
      if (!t) return { phase: 'none' as const, form: null, idempotencyKey: null };
      if (t.phase === 'handback') return { phase: 'handback' as const, form: null, idempotencyKey: null };
      const r = await requestQuery(ctx.db).where('r.id', '=', t.requestId).executeTakeFirst();
      if (!r || r.status !== 'open') {
        t.phase = 'handback';
        return { phase: 'handback' as const, form: null, idempotencyKey: null };
      }
      return { phase: 'signing' as const, form: await signingForm(ctx, r), idempotencyKey: t.idempotencyKey };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/tablet/submit',
    summary: 'Sign the lent form; the tablet then shows only the hand-back screen',
    tag: 'signing',
    auth: 'public',
    body: SubmitSignatureInputSchema,
    response: SubmitSignatureResultSchema,
    status: 201,
    errors: [404, 409],
    async handler({ ctx, req, body }) {
      const t = req.session?.tablet;
      if (!t) throw new ApiError('unauthenticated', 'This tablet is not lent for signing.');
      if (t.phase !== 'signing') throw conflict('This form is closed. Hand the tablet back to the department.', { reason: 'handback' });
      if (body.idempotencyKey !== t.idempotencyKey) throw invalid({ idempotencyKey: ['This submission does not belong to the form on this tablet.'] });
      const r = await ctx.db.selectFrom('signing_requests').selectAll().where('id', '=', t.requestId).executeTakeFirst();
      if (!r) throw notFound('The signing request');
      const result = await submitSignature(ctx, asOpenRequest(r), body, { ...clientMeta(req), method: 'tablet', staffUserId: t.staffUserId });
      t.phase = 'handback';
      return result;
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/tablet/decline',
    summary: 'The performer does not sign now: the tablet goes to the hand-back screen and the request stays open',
    tag: 'signing',
    auth: 'public',
    response: z.object({ ok: z.literal(true) }),
    async handler({ ctx, req }) {
      const t = req.session?.tablet;
      if (!t) throw new ApiError('unauthenticated', 'This tablet is not lent for signing.');
      if (t.phase !== 'signing') return { ok: true as const };
      t.phase = 'handback';
      await writeAudit(ctx.db, { actorUserId: t.staffUserId, action: 'tablet.declined', entityType: 'signing_request', entityId: t.requestId, req });
      return { ok: true as const };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/signing/:token',
    summary: 'The form a one-time signing link opens (nothing else)',
    tag: 'signing',
    auth: 'public',
    params: TokenParamsSchema,
    response: SigningFormSchema,
    before: [publicLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, params }) {
      const r = await requestByToken(ctx, params.token);
      await ctx.db.updateTable('signing_requests').set({ opened_at: sql`coalesce(opened_at, now())` }).where('id', '=', r.id).execute();
      return signingForm(ctx, r);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/signing/:token',
    summary: 'Sign through a one-time link; the link stops working once signed',
    tag: 'signing',
    auth: 'public',
    params: TokenParamsSchema,
    body: SubmitSignatureInputSchema,
    response: SubmitSignatureResultSchema,
    status: 201,
    before: [publicLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, req, params, body }) {
      const row = await ctx.db.selectFrom('signing_requests').selectAll().where('token_hash', '=', hashToken(params.token)).where('mode', '=', 'link').executeTakeFirst();
      if (!row || row.status === 'cancelled') throw notFound('This signing link');
      return submitSignature(ctx, asOpenRequest(row), body, { ...clientMeta(req), method: 'link', staffUserId: null });
    },
  }),
];
