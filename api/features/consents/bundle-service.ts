import type { Request } from 'express';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { capitalised } from '#shared/domain/words.ts';
import type { Actor } from '#shared/policy.ts';
import type { BundleLinkView, CreateSigningBundleInput, SigningBundle } from '#shared/schemas/consent-bundles.ts';
import type { SubmitSignatureInput } from '#shared/schemas/consents.ts';
import type { AppContext } from '../../context.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { ApiError, conflict, invalid, notFound } from '../../http/errors.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findPerformerScope } from '../performers/index.ts';
import { findBundle, findBundleByTokenHash, insertBundle } from './bundle-repo.ts';
import { departmentInWords, findDepartment, mailFooter } from '../productions/index.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { insertRequest, listBundleRequests, markRequestOpened, type RequestRecord, toSigningRequest } from './request-repo.ts';
import { asOpenRequest, lendTablet, signingForm } from './request-service.ts';
import { submitSignature } from './signing-service.ts';
import { isTemplateSendable } from './template-repo.ts';

const TABLET_BUNDLE_HOURS = 2;
const LINK_BUNDLE_DAYS = 7;

/** Asks a performer to sign several forms at once: one after another on this tablet, or from one e-mailed link. */
export async function createSigningBundle(ctx: AppContext, actor: Actor, input: CreateSigningBundleInput, req: Request): Promise<SigningBundle> {
  authorize(actor, 'consents.request', { productionId: input.productionId });
  const performer = await findPerformerScope(ctx.db, input.performerId);
  if (!performer || !performer.productionIds.includes(input.productionId)) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const stale: Record<string, string[]> = {};
  for (const [i, templateId] of input.templateIds.entries()) {
    if (!(await isTemplateSendable(ctx.db, templateId))) stale[`templateIds.${i}`] = ['This form is no longer in use. Choose a current form.'];
  }
  if (Object.keys(stale).length) throw invalid(stale, 'Some forms cannot be sent.');
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
  const expiresAt = new Date(Date.now() + (input.mode === 'link' ? LINK_BUNDLE_DAYS * 86_400_000 : TABLET_BUNDLE_HOURS * 3_600_000));
  // The bundle and all its requests are written together, or none of them.
  const bundleId = await ctx.db.transaction().execute(async (trx) => {
    const id = await insertBundle(trx, { performerId: input.performerId, productionId: input.productionId, mode: input.mode, tokenHash: token ? hashToken(token) : null, expiresAt, createdBy: actor.userId });
    for (const [i, templateId] of input.templateIds.entries()) {
      const requestId = await insertRequest(trx, { performerId: input.performerId, productionId: input.productionId, templateId, mode: input.mode, tokenHash: null, expiresAt, createdBy: actor.userId, bundleId: id, bundlePosition: i + 1 });
      await writeAudit(trx, {
        actorUserId: actor.userId,
        action: 'signing_request.create',
        entityType: 'signing_request',
        entityId: requestId,
        productionId: input.productionId,
        req,
        details: { performerId: input.performerId, mode: input.mode, bundleId: id, position: i + 1, of: input.templateIds.length },
      });
    }
    return id;
  });
  const requests = await listBundleRequests(ctx.db, bundleId);
  if (token && performer.email) {
    const dep = await findDepartment(ctx.db, input.productionId);
    const { failed } = await deliverAll(ctx, [
      {
        to: performer.email,
        subject: `Please read and sign ${requests.length === 1 ? 'one form' : `${requests.length} forms`}${dep.productionName ? ` for ${dep.productionName}` : ''}`,
        text: [
          `Hello ${performer.name},`,
          '',
          `${capitalised(departmentInWords(dep))} asks you to read and, if you agree, sign ${requests.length === 1 ? 'this form' : `these ${requests.length} forms`}, one after another:`,
          '',
          ...requests.map((r, i) => `${i + 1}. ${r.title} (${CONSENT_KIND_LABELS[r.kind].toLowerCase()})`),
          '',
          'One link opens them all, in this order:',
          `${ctx.config.appOrigin}/sign/bundle/${token}`,
          '',
          `It works until ${mailDateTime(expiresAt, ctx.config.timeZone)}. Each form is its own consent: you are free to sign some and not others, and not signing one keeps those you signed. Ask the department if anything is unclear.`,
          ...mailFooter(dep),
        ].join('\n'),
      },
    ]);
    if (failed.length) throw new ApiError('unavailable', 'The forms were saved, but the e-mail could not be sent. Try sending them again in a moment.');
  }
  return {
    id: bundleId,
    mode: input.mode,
    expiresAt: expiresAt.toISOString(),
    performer: { id: performer.id, name: performer.name },
    sentTo: input.mode === 'link' ? performer.email : null,
    requests: requests.map((r) => toSigningRequest(r)),
  };
}

/** Lends the tablet for a whole bundle: its forms come one after another, and the hand-back screen only at the end. */
export async function handOverBundle(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<{ ok: true; redirectTo: string }> {
  const bundle = await findBundle(ctx.db, id);
  if (!bundle) throw notFound('Those forms');
  authorize(actor, 'consents.request', { productionId: bundle.productionId });
  if (bundle.mode !== 'tablet') throw invalid({ id: ['These forms were sent as a link; they cannot be signed on the tablet.'] });
  const requests = await listBundleRequests(ctx.db, id);
  const open = requests.filter((r) => r.status === 'open' && r.expiresAt.getTime() > Date.now());
  const first = open.find((r) => !r.archived);
  if (!first) {
    throw conflict(open.length ? 'Every form still to sign was taken out of use after it was asked for. Ask again with current forms.' : 'No form of these is still open to sign.', {
      reason: open.length ? 'archived' : 'closed',
    });
  }
  const ids = open.map((r) => r.id);
  return lendTablet(ctx, actor, req, first, { requestIds: ids, index: ids.indexOf(first.id) });
}

async function bundleByToken(ctx: AppContext, token: string) {
  const bundle = await findBundleByTokenHash(ctx.db, hashToken(token));
  if (!bundle) throw notFound('This signing link');
  if (bundle.expiresAt.getTime() <= Date.now()) throw conflict('This signing link has expired. Ask the department to send a new one.', { reason: 'expired' });
  return bundle;
}

function itemState(r: RequestRecord): 'to_sign' | 'signed' | 'unavailable' {
  if (r.status === 'signed') return 'signed';
  if (r.status === 'cancelled' || r.archived) return 'unavailable';
  return 'to_sign';
}

/** Every form of one e-mailed link in order: those still to sign with their exact current text. */
export async function bundleLinkView(ctx: AppContext, token: string): Promise<BundleLinkView> {
  const bundle = await bundleByToken(ctx, token);
  const requests = await listBundleRequests(ctx.db, bundle.id);
  const dep = await findDepartment(ctx.db, bundle.productionId);
  const items = await Promise.all(
    requests.map(async (r) => {
      const state = itemState(r);
      return { requestId: r.id, title: r.title, kind: r.kind, state, form: state === 'to_sign' ? await signingForm(ctx, r) : null };
    }),
  );
  if (items.every((i) => i.state !== 'to_sign')) {
    if (items.some((i) => i.state === 'signed')) throw conflict('Every form of this link has been signed or withdrawn by the department. Each link works once.', { reason: 'signed' });
    throw new ApiError('not_found', 'The forms of this link were withdrawn by the department.', { reason: 'cancelled' });
  }
  await ctx.db.transaction().execute(async (trx) => {
    for (const r of requests) if (itemState(r) === 'to_sign') await markRequestOpened(trx, r.id, { keepFirst: true });
  });
  const performer = await findPerformerScope(ctx.db, bundle.performerId);
  return { performerName: performer?.name ?? '', productionName: dep.productionName, expiresAt: bundle.expiresAt.toISOString(), items };
}

/** Signs one form of an e-mailed bundle; each is its own consent, PDF and fingerprint. */
export async function bundleLinkSubmit(ctx: AppContext, token: string, requestId: string, input: SubmitSignatureInput, req: Request) {
  const bundle = await bundleByToken(ctx, token);
  const r = (await listBundleRequests(ctx.db, bundle.id)).find((x) => x.id === requestId);
  if (!r) throw notFound('That form');
  return submitSignature(ctx, asOpenRequest(r), input, { ip: req.ip ?? null, userAgent: req.get('user-agent')?.slice(0, 400) ?? null, method: 'link', staffUserId: null });
}
