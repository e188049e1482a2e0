import { randomUUID } from 'node:crypto';
import type { Request } from 'express';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { Actor } from '#shared/policy.ts';
import type { CreateSigningRequestInput, SigningForm, SigningRequest, SubmitSignatureInput, TabletState } from '#shared/schemas/consents.ts';
import { client } from '../../auth/oidc-client.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { ApiError, conflict, invalid, notFound } from '../../http/errors.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { findPerformerScope } from '../performers/index.ts';
import { departmentInWords, findDepartment, findProductionName, mailFooter } from '../productions/index.ts';
import { capitalised } from '#shared/domain/words.ts';
import { cancelOpenRequest, findLinkRequestByTokenHash, findRequest, insertRequest, listRequests, markRequestOpened, type RequestRecord, toSigningRequest } from './request-repo.ts';
import { submitSignature, type OpenRequest } from './signing-service.ts';
import { findCurrentTemplateVersion, isTemplateSendable } from './template-repo.ts';

const TABLET_REQUEST_HOURS = 2;
const LINK_REQUEST_DAYS = 7;

export function asOpenRequest(r: RequestRecord): OpenRequest {
  return { id: r.id, performerId: r.performerId, productionId: r.productionId, templateId: r.templateId, status: r.status, expiresAt: r.expiresAt };
}

async function requestById(ctx: AppContext, id: string): Promise<RequestRecord> {
  const r = await findRequest(ctx.db, id);
  if (!r) throw notFound('That signing request');
  return r;
}

export async function listSigningRequests(ctx: AppContext, actor: Actor, q: { productionId: string; performerId?: string; status?: 'open' | 'signed' | 'cancelled' }): Promise<SigningRequest[]> {
  authorize(actor, 'consents.request', { productionId: q.productionId });
  return (await listRequests(ctx.db, q)).map((r) => toSigningRequest(r));
}

/** Asks a performer to sign: on the tablet here, or by a one-time link to the address they confirmed. */
export async function createSigningRequest(ctx: AppContext, actor: Actor, input: CreateSigningRequestInput, req: Request): Promise<SigningRequest> {
  authorize(actor, 'consents.request', { productionId: input.productionId });
  const performer = await findPerformerScope(ctx.db, input.performerId);
  if (!performer || !performer.productionIds.includes(input.productionId)) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  if (!(await isTemplateSendable(ctx.db, input.templateId))) throw invalid({ templateId: ['Choose a current form.'] });
  if (input.mode === 'link' && !performer.email) {
    throw invalid({
      mode: [
        performer.emailUnconfirmed
          ? 'The performer has not yet confirmed their e-mail address, so no signing link can go to it. Sign on the tablet, or ask them to confirm it first.'
          : 'This performer has no e-mail address on record. Add one, or sign on the tablet.',
      ],
    });
  }
  const token = input.mode === 'link' ? newToken() : null;
  const expiresAt = new Date(Date.now() + (input.mode === 'link' ? LINK_REQUEST_DAYS * 86_400_000 : TABLET_REQUEST_HOURS * 3_600_000));
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertRequest(trx, { performerId: input.performerId, productionId: input.productionId, templateId: input.templateId, mode: input.mode, tokenHash: token ? hashToken(token) : null, expiresAt, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'signing_request.create', entityType: 'signing_request', entityId: newId, productionId: input.productionId, req, details: { performerId: input.performerId, mode: input.mode } });
    return newId;
  });
  const row = await requestById(ctx, id);
  if (token && performer.email) {
    const dep = await findDepartment(ctx.db, input.productionId);
    const { failed } = await deliverAll(ctx, [
      {
        to: performer.email,
        subject: `Please read and sign: ${row.title}${dep.productionName ? ` (${dep.productionName})` : ''}`,
        text: [
          `Hello ${performer.name},`,
          '',
          `${capitalised(departmentInWords(dep))} asks you to read and, if you agree, sign this ${CONSENT_KIND_LABELS[row.kind].toLowerCase()} form:`,
          '',
          `${ctx.config.appOrigin}/sign/${token}`,
          '',
          `The link works once and until ${mailDateTime(expiresAt, ctx.config.timeZone)}. You are free not to sign; ask the department if anything is unclear.`,
          ...mailFooter(dep),
        ].join('\n'),
      },
    ]);
    // The request stands either way; saying so lets staff send again rather than wonder.
    if (failed.length) throw new ApiError('unavailable', 'The request was saved, but the e-mail could not be sent. Try sending it again in a moment.');
  }
  return toSigningRequest(row);
}

export async function cancelSigningRequest(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<SigningRequest> {
  const r = await requestById(ctx, id);
  authorize(actor, 'consents.request', { productionId: r.productionId });
  if (r.status !== 'open') throw conflict('Only an open request can be cancelled.');
  await ctx.db.transaction().execute(async (trx) => {
    if (!(await cancelOpenRequest(trx, id))) throw conflict('Only an open request can be cancelled.');
    await writeAudit(trx, { actorUserId: actor.userId, action: 'signing_request.cancel', entityType: 'signing_request', entityId: id, productionId: r.productionId, req });
  });
  return toSigningRequest({ ...r, status: 'cancelled' });
}

/**
 * Lends this browser to the performer: the staff member's access leaves the session, which is
 * locked to the one form, and the browser goes through the identity provider's sign-out so no
 * remembered sign-in survives on the tablet.
 */
export async function handOver(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<{ ok: true; redirectTo: string }> {
  const r = await requestById(ctx, id);
  authorize(actor, 'consents.request', { productionId: r.productionId });
  if (r.mode !== 'tablet') throw invalid({ id: ['This request was sent as a link; it cannot be signed on the tablet.'] });
  if (r.status !== 'open' || r.expiresAt.getTime() <= Date.now()) throw conflict('This request is no longer open.');
  if (r.archived) throw conflict('This form was taken out of use after it was asked for. Ask again with a current form.', { reason: 'archived' });
  return lendTablet(ctx, actor, req, r);
}

/**
 * Locks this browser's session to the first form (and, for a bundle, the ones after it): the
 * staff member's access leaves the session and the browser goes through the identity provider's
 * sign-out on its way to the form.
 */
export async function lendTablet(ctx: AppContext, actor: Actor, req: Request, first: RequestRecord, bundle?: { requestIds: string[]; index: number }): Promise<{ ok: true; redirectTo: string }> {
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'tablet.hand_over', entityType: 'signing_request', entityId: first.id, productionId: first.productionId, req, details: bundle ? { bundleSize: bundle.requestIds.length } : undefined });
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
  delete req.session.userId;
  delete req.session.idToken;
  req.session.tablet = { requestId: first.id, staffUserId: actor.userId, phase: 'signing', idempotencyKey: randomUUID(), ...(bundle ? { bundle } : {}) };
  // A lent tablet left alone locks sooner than a staff session would.
  req.session.cookie.maxAge = ctx.config.tabletIdleMs;
  await ctx.db.transaction().execute((trx) => markRequestOpened(trx, first.id));
  return { ok: true, redirectTo };
}

/** A request the tablet can still show: open, in time, and its form still in use. */
function signable(r: RequestRecord | undefined): r is RequestRecord {
  return Boolean(r && r.status === 'open' && r.expiresAt.getTime() > Date.now() && !r.archived);
}

type TabletLock = NonNullable<Request['session']['tablet']>;

/**
 * After a form is signed or declined: a bundle moves on to its next form still to sign (one
 * archived meanwhile is passed over); otherwise, or at the end, the tablet goes to the hand-back screen.
 */
async function advanceTablet(ctx: AppContext, t: TabletLock): Promise<void> {
  if (t.bundle) {
    for (let i = t.bundle.index + 1; i < t.bundle.requestIds.length; i++) {
      const next = await findRequest(ctx.db, t.bundle.requestIds[i]!);
      if (signable(next)) {
        t.bundle.index = i;
        t.requestId = next.id;
        t.idempotencyKey = randomUUID();
        t.phase = 'signing';
        await ctx.db.transaction().execute((trx) => markRequestOpened(trx, next.id));
        return;
      }
    }
  }
  t.phase = 'handback';
}

/** The exact current text of the requested form, frozen for this viewing by its version id. */
export async function signingForm(ctx: AppContext, r: RequestRecord): Promise<SigningForm> {
  const template = await findCurrentTemplateVersion(ctx.db, r.templateId);
  if (!template) throw notFound('The form');
  return {
    requestId: r.id,
    performerName: r.performerName,
    productionName: r.productionId ? await findProductionName(ctx.db, r.productionId) : null,
    expiresAt: r.expiresAt.toISOString(),
    template: { versionId: template.versionId, version: template.version, kind: template.kind, title: template.title, body: template.body, questions: template.questions, validityDays: template.validityDays },
  };
}

export async function tabletState(ctx: AppContext, req: Request): Promise<TabletState> {
  const t = req.session?.tablet;
  if (!t) return { phase: 'none', form: null, idempotencyKey: null };
  if (t.phase === 'signing' && !signable(await findRequest(ctx.db, t.requestId))) await advanceTablet(ctx, t);
  if (t.phase === 'handback') return { phase: 'handback', form: null, idempotencyKey: null };
  const r = (await findRequest(ctx.db, t.requestId))!;
  const progress = t.bundle ? { progress: { position: t.bundle.index + 1, total: t.bundle.requestIds.length } } : {};
  return { phase: 'signing', form: await signingForm(ctx, r), idempotencyKey: t.idempotencyKey, ...progress };
}

function clientMeta(req: Request) {
  return { ip: req.ip ?? null, userAgent: req.get('user-agent')?.slice(0, 400) ?? null };
}

export async function tabletSubmit(ctx: AppContext, input: SubmitSignatureInput, req: Request) {
  const t = req.session?.tablet;
  if (!t) throw new ApiError('unauthenticated', 'This tablet is not lent for signing.');
  if (t.phase !== 'signing') throw conflict('This form is closed. Hand the tablet back to the department.', { reason: 'handback' });
  if (input.idempotencyKey !== t.idempotencyKey) throw invalid({ idempotencyKey: ['This submission does not belong to the form on this tablet.'] });
  const r = await findRequest(ctx.db, t.requestId);
  if (!r) throw notFound('The signing request');
  const result = await submitSignature(ctx, asOpenRequest(r), input, { ...clientMeta(req), method: 'tablet', staffUserId: t.staffUserId });
  await advanceTablet(ctx, t);
  return result;
}

export async function tabletDecline(ctx: AppContext, req: Request): Promise<{ ok: true }> {
  const t = req.session?.tablet;
  if (!t) throw new ApiError('unauthenticated', 'This tablet is not lent for signing.');
  if (t.phase !== 'signing') return { ok: true };
  await recordEvent(ctx.db, { actorUserId: t.staffUserId, action: 'tablet.decline', entityType: 'signing_request', entityId: t.requestId, req });
  // Declining one form of a bundle keeps those already signed and moves on to the next.
  await advanceTablet(ctx, t);
  return { ok: true };
}

/** The request a one-time link names, or why it cannot be used. */
async function requestByToken(ctx: AppContext, token: string): Promise<RequestRecord> {
  const r = await findLinkRequestByTokenHash(ctx.db, hashToken(token));
  if (!r) throw notFound('This signing link');
  if (r.status === 'cancelled') throw new ApiError('not_found', 'This signing link was withdrawn by the department.', { reason: 'cancelled' });
  if (r.status === 'signed') throw conflict('This form has already been signed through this link. Each link works once.', { reason: 'signed' });
  if (r.expiresAt.getTime() <= Date.now()) throw conflict('This signing link has expired. Ask the department to send a new one.', { reason: 'expired' });
  return r;
}

export async function linkForm(ctx: AppContext, token: string): Promise<SigningForm> {
  const r = await requestByToken(ctx, token);
  await ctx.db.transaction().execute((trx) => markRequestOpened(trx, r.id, { keepFirst: true }));
  return signingForm(ctx, r);
}

export async function linkSubmit(ctx: AppContext, token: string, input: SubmitSignatureInput, req: Request) {
  const r = await findLinkRequestByTokenHash(ctx.db, hashToken(token));
  if (!r || r.status === 'cancelled') throw notFound('This signing link');
  return submitSignature(ctx, asOpenRequest(r), input, { ...clientMeta(req), method: 'link', staffUserId: null });
}
