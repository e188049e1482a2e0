import type { Request } from 'express';
import { sql } from 'kysely';
import { z } from 'zod';
import { CONSENT_KIND_LABELS, consentState, withdrawalConsequences } from '#shared/domain/consent.ts';
import { type Actor, can, canSomewhere } from '#shared/policy.ts';
import { VERIFY_MAX_BYTES } from '#shared/limits.ts';
import { isMedicalAnswer } from '#shared/domain/questionnaire.ts';
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
import type { AppContext } from '../../context.ts';
import { readStoredFile, sha256Hex } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, forbidden, invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { rateLimiter } from '../../http/rate-limit.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { receiveFile } from '../../http/upload.ts';
import { afterResponse } from '../../http/after-response.ts';
import { findConfirmedEmail } from '../identity/repo.ts';
import { consentSummaryQuery, performerScope, toConsentSummary } from './repo.ts';

const WITHDRAWAL_LINK_HOURS = 24;

type Scope = NonNullable<Awaited<ReturnType<typeof performerScope>>>;

function resourceOf(scope: Scope) {
  return { performerId: scope.id, performerProductionIds: scope.productionIds };
}

function canView(actor: Actor, scope: Scope): boolean {
  return can(actor, 'performers.view', resourceOf(scope)) || can(actor, 'performer.self', resourceOf(scope));
}

/** The performer themself, or the designated lead of a production they are engaged on. */
function canWithdraw(actor: Actor, scope: Scope): boolean {
  return can(actor, 'performer.self', resourceOf(scope)) || scope.productionIds.some((p) => actor.leadOf.includes(p));
}

async function loadConsent(ctx: AppContext, id: string) {
  const row = await consentSummaryQuery(ctx.db)
    .select(['v.body', 'c.withdrawal_reason', 'c.withdrawn_via', 'c.pdf_sha256', 'c.content_sha256', 'c.pdf_file_id'])
    .where('c.id', '=', id)
    .executeTakeFirst();
  if (!row) throw notFound('That consent');
  const performer = (await performerScope(ctx.db, row.performer_id))!;
  // A consent given to one production is that production's record: its staff and its lead, and the performer.
  const scope = row.production_id ? { ...performer, productionIds: performer.productionIds.filter((p) => p === row.production_id) } : performer;
  return { row, scope };
}

async function withdraw(ctx: AppContext, req: Request, consentId: string, opts: { reason?: string; version?: number; by: string | null; byPerformer?: string; via: 'performer' | 'lead' | 'link' }) {
  return ctx.db.transaction().execute(async (trx) => {
    const c = await trx.selectFrom('consents').select(['id', 'performer_id', 'production_id', 'kind', 'version', 'withdrawn_at', 'signed_at', 'expires_at']).where('id', '=', consentId).forUpdate().executeTakeFirst();
    if (!c) throw notFound('That consent');
    if (c.withdrawn_at) throw conflict('This consent has already been withdrawn.');
    if (opts.version !== undefined && c.version !== opts.version) throw conflict('This consent changed since you opened it. Reload to see it.');
    if (consentState({ signedAt: new Date(c.signed_at), expiresAt: c.expires_at, withdrawnAt: null }, new Date()) === 'expired') {
      throw conflict('This consent has already expired; there is nothing to withdraw.');
    }
    await trx
      .updateTable('consents')
      .set({ withdrawn_at: new Date(), withdrawn_by_user_id: opts.by, withdrawn_via: opts.via, withdrawal_reason: opts.reason || null, version: sql`version + 1` })
      .where('id', '=', consentId)
      .execute();
    await writeAudit(trx, { actorUserId: opts.by, actorPerformerId: opts.byPerformer ?? null, action: 'consent.withdraw', entityType: 'consent', entityId: consentId, productionId: c.production_id, req, details: { via: opts.via, kind: c.kind } });
    return c;
  });
}

async function sendWithdrawalConfirmation(ctx: AppContext, performerId: string, kind: keyof typeof CONSENT_KIND_LABELS): Promise<void> {
  const p = await findConfirmedEmail(ctx.db, performerId);
  if (!p) return;
  try {
    await ctx.mailer.send({
      to: p.email,
      subject: `Your ${CONSENT_KIND_LABELS[kind].toLowerCase()} consent has been withdrawn`,
      text: [`Hello ${p.name},`, '', `Your ${CONSENT_KIND_LABELS[kind].toLowerCase()} consent is withdrawn as of ${new Date().toUTCString()}.`, ...withdrawalConsequences(kind), '', 'If you did not ask for this, contact the make-up department.'].join('\n'),
    });
  } catch (err) {
    ctx.log('withdrawal confirmation not sent', err);
  }
}

const linkLimiter = rateLimiter({ windowMs: 60_000, limit: 10, message: 'Too many attempts. Wait a minute and try again.' });

async function linkByToken(ctx: AppContext, token: string) {
  const link = await ctx.db.selectFrom('withdrawal_links').selectAll().where('token_hash', '=', hashToken(token)).executeTakeFirst();
  if (!link) throw notFound('This withdrawal link');
  if (new Date(link.expires_at).getTime() <= Date.now()) throw conflict('This withdrawal link has expired. Request a new one.');
  return link;
}

/** At most this many withdrawal links go to one address in an hour, whoever asks and from wherever. */
const LINKS_PER_ADDRESS_PER_HOUR = 3;

async function sendWithdrawalLink(ctx: AppContext, req: Request, email: string): Promise<void> {
  const token = newToken();
  const p = await ctx.db.transaction().execute(async (trx) => {
    // Only an address the performer confirmed: a link to withdraw is the performer's power alone.
    // The row lock makes concurrent requests for one address count one after another.
    const p = await trx
      .selectFrom('performers')
      .select(['id', 'email', sql<string>`coalesce(preferred_name, legal_name)`.as('name')])
      .where(sql`lower(email)`, '=', email)
      .where('email_confirmed_at', 'is not', null)
      .forUpdate()
      .executeTakeFirst();
    if (!p?.email) return null;
    const recent = await trx
      .selectFrom('withdrawal_links')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('performer_id', '=', p.id)
      .where('created_at', '>', new Date(Date.now() - 3_600_000))
      .executeTakeFirstOrThrow();
    if (Number(recent.n) >= LINKS_PER_ADDRESS_PER_HOUR) {
      await writeAudit(trx, { actorUserId: null, action: 'withdrawal_link.capped', entityType: 'performer', entityId: p.id, req });
      return null;
    }
    await trx.insertInto('withdrawal_links').values({ performer_id: p.id, token_hash: hashToken(token), expires_at: new Date(Date.now() + WITHDRAWAL_LINK_HOURS * 3_600_000) }).execute();
    await writeAudit(trx, { actorUserId: null, action: 'withdrawal_link.create', entityType: 'performer', entityId: p.id, req });
    return { email: p.email, name: p.name };
  });
  if (!p) return;
  await ctx.mailer.send({
    to: p.email,
    subject: 'Your link to withdraw consents',
    text: [`Hello ${p.name},`, '', 'You asked for a link to see and withdraw the consents you gave the make-up department:', '', `${ctx.config.appOrigin}/withdraw/${token}`, '', 'It works for 24 hours. If you did not ask for it, you can ignore this e-mail.'].join('\n'),
  });
}

const TokenParams = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{40,60}$/, 'Not a withdrawal link') });

export const consentRoutes = [
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
      const scope = await performerScope(ctx.db, query.performerId);
      if (!scope || !canView(actor, scope)) throw forbidden("see this performer's consents");
      const rows = await consentSummaryQuery(ctx.db).where('c.performer_id', '=', query.performerId).orderBy('c.signed_at', 'desc').execute();
      const self = can(actor, 'performer.self', resourceOf(scope));
      const items = rows
        .map((r) => toConsentSummary(r))
        .filter((c) => !query.state || c.state === query.state)
        // Staff see consents given to productions they work on; the performer sees all of theirs.
        .filter((c) => self || c.productionId === null || can(actor, 'performers.view', { productionId: c.productionId }));
      return { items };
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
    async handler({ ctx, actor, params, req }) {
      const { row, scope } = await loadConsent(ctx, params.id);
      if (!canView(actor, scope)) throw forbidden('see this consent');
      const medicalOk = can(actor, 'medical.read', resourceOf(scope));
      const stored = await ctx.db.selectFrom('consent_answers').select(['question_id', 'question_label', 'medical', 'answer']).where('consent_id', '=', params.id).orderBy('id').execute();
      const answers = stored.map((a) => ({ ...a, medical: isMedicalAnswer(row.kind, a.medical) }));
      const hasMedical = answers.some((a) => a.medical);
      const shown = answers.filter((a) => !a.medical || medicalOk);
      // A withdrawal reason may speak of health, so reading one counts as a medical read too.
      if (medicalOk && (hasMedical || row.withdrawal_reason)) {
        await writeAudit(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'consent', entityId: params.id, productionId: row.production_id, req, details: { performerId: scope.id, fields: answers.filter((a) => a.medical).map((a) => a.question_id) } });
      }
      const summary = toConsentSummary(row);
      return {
        ...summary,
        body: row.body,
        answers: shown.map((a) => ({ questionId: a.question_id, label: a.question_label, medical: a.medical, answer: a.answer as boolean | string | null })),
        medicalWithheld: hasMedical && !medicalOk,
        withdrawalReason: medicalOk ? row.withdrawal_reason : null,
        withdrawnVia: row.withdrawn_via,
        pdfSha256: row.pdf_sha256,
        contentSha256: row.content_sha256,
        canDownloadPdf: medicalOk || !hasMedical,
        canWithdraw: summary.state === 'active' && canWithdraw(actor, scope),
        consequences: withdrawalConsequences(row.kind),
      };
    },
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
      const { row, scope } = await loadConsent(ctx, params.id);
      if (!canView(actor, scope)) throw forbidden('see this consent');
      const answers = await ctx.db.selectFrom('consent_answers').select('medical').where('consent_id', '=', params.id).execute();
      if (answers.some((a) => isMedicalAnswer(row.kind, a.medical))) {
        if (!can(actor, 'medical.read', resourceOf(scope))) throw forbidden('see health details');
        await writeAudit(ctx.db, { actorUserId: actor.userId, action: 'medical.read', entityType: 'consent_pdf', entityId: params.id, productionId: row.production_id, req, details: { performerId: scope.id } });
      }
      const file = await readStoredFile(ctx.db, ctx.config.storageDir, row.pdf_file_id);
      if (!file) throw notFound('The PDF');
      res.type('application/pdf').set('Content-Disposition', `inline; filename="consent-${params.id}.pdf"`).send(file.bytes);
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
    async handler({ ctx, actor, params, body, req }) {
      const { scope } = await loadConsent(ctx, params.id);
      if (!canWithdraw(actor, scope)) throw forbidden('withdraw this consent');
      const via = can(actor, 'performer.self', resourceOf(scope)) ? 'performer' : 'lead';
      const c = await withdraw(ctx, req, params.id, { reason: body.reason, version: body.version, by: actor.userId, via });
      await sendWithdrawalConfirmation(ctx, c.performer_id, c.kind);
      const after = await consentSummaryQuery(ctx.db).where('c.id', '=', params.id).executeTakeFirstOrThrow();
      const s = toConsentSummary(after);
      return { id: s.id, state: s.state, withdrawnAt: s.withdrawnAt, version: s.version };
    },
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
      if (!actor.isAdmin && !canSomewhere(actor, 'performers.view')) throw forbidden('verify consent documents');
      // Read only once the permission check has passed.
      const file = await receiveFile(req, res, { field: 'file', maxBytes: VERIFY_MAX_BYTES });
      if (!file) throw invalid({ file: ['Choose a PDF to check'] });
      const sha256 = sha256Hex(file.buffer);
      const row = await consentSummaryQuery(ctx.db).where('c.pdf_sha256', '=', sha256).executeTakeFirst();
      await writeAudit(ctx.db, { actorUserId: actor.userId, action: 'consent.verify', entityType: 'consent', entityId: row?.id ?? null, req, details: { sha256, match: Boolean(row) } });
      if (!row) return { sha256, match: false, elsewhere: false, consent: null };
      // Who signed what is told only to those who may see that consent.
      const { scope } = await loadConsent(ctx, row.id);
      if (!canView(actor, scope)) return { sha256, match: true, elsewhere: true, consent: null };
      const s = toConsentSummary(row);
      return { sha256, match: true, elsewhere: false, consent: { id: s.id, performerName: s.performerName, kind: s.kind, title: s.title, templateVersion: s.templateVersion, signedAt: s.signedAt, state: s.state } };
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
    async handler({ ctx, params }) {
      const link = await linkByToken(ctx, params.token);
      const scope = (await performerScope(ctx.db, link.performer_id))!;
      const rows = await consentSummaryQuery(ctx.db).where('c.performer_id', '=', link.performer_id).orderBy('c.signed_at', 'desc').execute();
      return {
        performerName: scope.name,
        expiresAt: new Date(link.expires_at).toISOString(),
        consents: rows.map((r) => ({ ...toConsentSummary(r), consequences: withdrawalConsequences(r.kind) })),
      };
    },
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
      const link = await linkByToken(ctx, params.token);
      const c = await ctx.db.selectFrom('consents').select(['performer_id']).where('id', '=', body.consentId).executeTakeFirst();
      if (!c || c.performer_id !== link.performer_id) throw notFound('That consent');
      // The link is the performer's: the withdrawal is recorded as their act, through their sign-in if they have one.
      const owner = await ctx.db.selectFrom('performers').select('user_id').where('id', '=', link.performer_id).executeTakeFirst();
      const done = await withdraw(ctx, req, body.consentId, { reason: body.reason, by: owner?.user_id ?? null, byPerformer: link.performer_id, via: 'link' });
      await ctx.db.updateTable('withdrawal_links').set({ used_at: sql`coalesce(used_at, now())` }).where('id', '=', link.id).execute();
      await sendWithdrawalConfirmation(ctx, done.performer_id, done.kind);
      return { ok: true as const };
    },
  }),
];
