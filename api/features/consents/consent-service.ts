import type { Request } from 'express';
import { CONSENT_KIND_LABELS, type ConsentKind, consentState, withdrawalConsequences } from '#shared/domain/consent.ts';
import { isMedicalAnswer } from '#shared/domain/questionnaire.ts';
import type { Actor } from '#shared/policy.ts';
import { can } from '#shared/policy.ts';
import type { ConsentDetail, ConsentSummary, VerifyResult } from '#shared/schemas/consents.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { readStoredFile, sha256Hex } from '../../files/store.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, notFound } from '../../http/errors.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { findConfirmedEmail, findPerformerScope, lockPerformerByConfirmedEmail } from '../performers/index.ts';
import {
  findConsentDetailRow,
  findConsentPerformer,
  findConsentSummary,
  findConsentByAnyPdfHash,
  listConsentAnswers,
  listConsentSummaries,
  lockConsentForWithdrawal,
  markConsentWithdrawn,
} from './consent-repo.ts';
import { departmentInWords, findDepartment, findDepartments, mailFooter } from '../productions/index.ts';
import { sendWithdrawalNotices } from './notice-service.ts';
import { countRecentWithdrawalLinks, findWithdrawalLinkByHash, insertWithdrawalLink, markWithdrawalLinkUsed } from './request-repo.ts';

const WITHDRAWAL_LINK_HOURS = 24;
/** At most this many withdrawal links go to one address in an hour, whoever asks and from wherever. */
const LINKS_PER_ADDRESS_PER_HOUR = 3;

/**
 * The resource a consent is for permission questions: its performer, and the production it was
 * given to (a consent given to one production is that production's record), or, for a consent
 * naming none, every production the performer works on.
 */
export async function consentResource(db: Db, performerId: string, productionId: string | null) {
  const performer = await findPerformerScope(db, performerId);
  if (!performer) throw notFound('That consent');
  const performerProductionIds = productionId ? performer.productionIds.filter((p) => p === productionId) : performer.productionIds;
  return { performer, resource: { performerId, performerProductionIds } };
}

/** A performer's consents the actor may see: staff those given to productions they work on; the performer all of theirs. */
export async function listVisibleConsents(ctx: AppContext, actor: Actor, performerId: string, state?: ConsentSummary['state']): Promise<ConsentSummary[]> {
  const performer = await findPerformerScope(ctx.db, performerId);
  const resource = { performerId, performerProductionIds: performer?.productionIds ?? [] };
  if (!performer) throw notFound('That performer');
  authorize(actor, 'consents.view', resource);
  const items = await listConsentSummaries(ctx.db, performerId);
  return items
    .filter((c) => !state || c.state === state)
    .filter((c) => can(actor, 'consents.view', { performerId, performerProductionIds: c.productionId ? [c.productionId] : performer.productionIds }));
}

/** One consent: health answers only to the designated lead and the performer, and every such read audited. */
export async function consentDetail(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<ConsentDetail> {
  const row = await findConsentDetailRow(ctx.db, id);
  if (!row) throw notFound('That consent');
  const { resource } = await consentResource(ctx.db, row.summary.performerId, row.summary.productionId);
  authorize(actor, 'consents.view', resource);
  const medicalOk = can(actor, 'medical.read', resource);
  const answers = (await listConsentAnswers(ctx.db, id)).map((a) => ({ ...a, medical: isMedicalAnswer(row.summary.kind, a.medical) }));
  const hasMedical = answers.some((a) => a.medical);
  // A withdrawal reason may speak of health, so reading one counts as a medical read too.
  if (medicalOk && (hasMedical || row.withdrawalReason)) {
    await recordEvent(ctx.db, {
      actorUserId: actor.userId,
      action: 'medical.read',
      performerId: row.summary.performerId,
      entityType: 'consent',
      entityId: id,
      productionId: row.summary.productionId,
      req,
      details: { performerId: row.summary.performerId, fields: [...answers.filter((a) => a.medical).map((a) => a.questionId), ...(row.withdrawalReason ? ['withdrawalReason'] : [])] },
    });
  }
  const s = row.summary;
  return {
    ...s,
    body: row.body,
    answers: answers.filter((a) => !a.medical || medicalOk),
    medicalWithheld: hasMedical && !medicalOk,
    withdrawalReason: medicalOk ? row.withdrawalReason : null,
    withdrawnVia: row.withdrawnVia,
    pdfSha256: row.pdfSha256,
    contentSha256: row.contentSha256,
    canDownloadPdf: medicalOk || !hasMedical,
    canWithdraw: s.state === 'active' && can(actor, 'consents.withdraw', resource),
    consequences: withdrawalConsequences(s.kind),
  };
}

/** The signed PDF: it carries the answers, so health answers restrict it like the fields themselves. */
export async function consentPdf(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Buffer> {
  const row = await findConsentDetailRow(ctx.db, id);
  if (!row) throw notFound('That consent');
  const { resource } = await consentResource(ctx.db, row.summary.performerId, row.summary.productionId);
  authorize(actor, 'consents.view', resource);
  const answers = await listConsentAnswers(ctx.db, id);
  const medicalAnswers = answers.filter((a) => isMedicalAnswer(row.summary.kind, a.medical));
  if (medicalAnswers.length > 0) {
    authorize(actor, 'medical.read', resource);
    const fields = medicalAnswers.map((a) => a.questionId);
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId: row.summary.performerId, entityType: 'consent_pdf', entityId: id, productionId: row.summary.productionId, req, details: { performerId: row.summary.performerId, fields } });
  }
  const file = await readStoredFile(ctx.db, ctx.files, row.pdfFileId);
  if (!file) throw notFound('The PDF');
  return file.bytes;
}

async function withdraw(ctx: AppContext, req: Request, consentId: string, opts: { reason?: string; version?: number; by: string | null; byPerformer?: string; via: 'performer' | 'lead' | 'link' }) {
  return ctx.db.transaction().execute(async (trx) => {
    const c = await lockConsentForWithdrawal(trx, consentId);
    if (!c) throw notFound('That consent');
    if (c.withdrawnAt) throw conflict('This consent has already been withdrawn.');
    if (opts.version !== undefined && c.version !== opts.version) throw conflict('This consent changed since you opened it. Reload to see it.');
    if (consentState({ signedAt: c.signedAt, expiresAt: c.expiresAt, withdrawnAt: null }, new Date()) === 'expired') {
      throw conflict('This consent has already expired; there is nothing to withdraw.');
    }
    await markConsentWithdrawn(trx, consentId, { by: opts.by, via: opts.via, reason: opts.reason || null });
    await writeAudit(trx, { actorUserId: opts.by, actorPerformerId: opts.byPerformer ?? null, action: 'consent.withdraw', entityType: 'consent', entityId: consentId, productionId: c.productionId, req, details: { via: opts.via, kind: c.kind } });
    return c;
  });
}

async function sendWithdrawalConfirmation(ctx: AppContext, performerId: string, kind: ConsentKind, productionId: string | null): Promise<void> {
  const p = await findConfirmedEmail(ctx.db, performerId);
  if (!p) return;
  const dep = await findDepartment(ctx.db, productionId);
  // A consent naming no production was given to the department at large: every production the performer works on.
  const footer = productionId ? mailFooter(dep) : mailFooter(await findDepartments(ctx.db, (await findPerformerScope(ctx.db, performerId))?.productionIds ?? []));
  await deliverAll(ctx, [
    {
      to: p.email,
      subject: `Your ${CONSENT_KIND_LABELS[kind].toLowerCase()} consent has been withdrawn${dep.productionName ? ` (${dep.productionName})` : ''}`,
      text: [
        `Hello ${p.name},`,
        '',
        `Your ${CONSENT_KIND_LABELS[kind].toLowerCase()} consent${dep.productionName ? ` for ${dep.productionName}` : ''} is withdrawn as of ${mailDateTime(new Date(), ctx.config.timeZone)}.`,
        ...withdrawalConsequences(kind),
        '',
        `If you did not ask for this, contact ${departmentInWords(dep)}.`,
        ...footer,
      ].join('\n'),
    },
  ]);
}

/** The performer themself, or the designated lead of the consent's production, withdraws it. */
export async function withdrawAsActor(ctx: AppContext, actor: Actor, consentId: string, input: { reason?: string; version: number }, req: Request) {
  const summary = await findConsentSummary(ctx.db, consentId);
  if (!summary) throw notFound('That consent');
  const { resource } = await consentResource(ctx.db, summary.performerId, summary.productionId);
  authorize(actor, 'consents.withdraw', resource);
  const via = can(actor, 'performer.self', resource) ? 'performer' : 'lead';
  const c = await withdraw(ctx, req, consentId, { reason: input.reason, version: input.version, by: actor.userId, via });
  await sendWithdrawalConfirmation(ctx, c.performerId, c.kind, c.productionId);
  await sendWithdrawalNotices(ctx, consentId);
  const after = (await findConsentSummary(ctx.db, consentId))!;
  return { id: after.id, state: after.state, withdrawnAt: after.withdrawnAt, version: after.version };
}

/** Is this PDF, byte for byte, one Plinth issued? Who signed what is told only to those who may see that consent. */
export async function verifyPdf(ctx: AppContext, actor: Actor, bytes: Buffer, req: Request): Promise<VerifyResult> {
  const sha256 = sha256Hex(bytes);
  const found = await findConsentByAnyPdfHash(ctx.db, sha256);
  const s = found?.summary;
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'consent.verify', entityType: 'consent', entityId: s?.id ?? null, req, details: { sha256, match: Boolean(s), copy: found?.copy ?? null } });
  if (!s) return { sha256, match: false, elsewhere: false, consent: null, copy: null };
  const { resource } = await consentResource(ctx.db, s.performerId, s.productionId);
  if (!can(actor, 'consents.view', resource)) return { sha256, match: true, elsewhere: true, consent: null, copy: null };
  return { sha256, match: true, elsewhere: false, copy: found.copy, consent: { id: s.id, performerName: s.performerName, kind: s.kind, title: s.title, templateVersion: s.templateVersion, signedAt: s.signedAt, state: s.state } };
}

// ---- withdrawal links (a performer without a sign-in)

/** Makes and mails a withdrawal link, only to a confirmed address and at most a few an hour; run after the reply. */
export async function sendWithdrawalLink(ctx: AppContext, req: Request, email: string): Promise<void> {
  const token = newToken();
  const expiresAt = new Date(Date.now() + WITHDRAWAL_LINK_HOURS * 3_600_000);
  const p = await ctx.db.transaction().execute(async (trx) => {
    // The row lock makes concurrent requests for one address count one after another.
    const p = await lockPerformerByConfirmedEmail(trx, email);
    if (!p) return null;
    if ((await countRecentWithdrawalLinks(trx, p.id, new Date(Date.now() - 3_600_000))) >= LINKS_PER_ADDRESS_PER_HOUR) {
      await writeAudit(trx, { actorUserId: null, action: 'withdrawal_link.cap', entityType: 'performer', entityId: p.id, req });
      return null;
    }
    await insertWithdrawalLink(trx, p.id, hashToken(token), expiresAt);
    await writeAudit(trx, { actorUserId: null, action: 'withdrawal_link.create', entityType: 'performer', entityId: p.id, req });
    return p;
  });
  if (!p) return;
  const deps = await findDepartments(ctx.db, (await findPerformerScope(ctx.db, p.id))?.productionIds ?? []);
  await deliverAll(ctx, [
    {
      to: p.email,
      subject: 'Your link to withdraw consents',
      text: [
        `Hello ${p.name},`,
        '',
        'You asked for a link to see and withdraw the consents you gave the make-up department:',
        '',
        `${ctx.config.appOrigin}/withdraw/${token}`,
        '',
        `It works for ${WITHDRAWAL_LINK_HOURS} hours, until ${mailDateTime(expiresAt, ctx.config.timeZone)}. If you did not ask for it, you can ignore this e-mail.`,
        ...mailFooter(deps),
      ].join('\n'),
    },
  ]);
}

async function linkByToken(db: Db, token: string) {
  const link = await findWithdrawalLinkByHash(db, hashToken(token));
  if (!link) throw notFound('This withdrawal link');
  if (link.expiresAt.getTime() <= Date.now()) throw conflict('This withdrawal link has expired. Request a new one.');
  return link;
}

export async function withdrawalLinkView(ctx: AppContext, token: string) {
  const link = await linkByToken(ctx.db, token);
  const performer = (await findPerformerScope(ctx.db, link.performerId))!;
  const consents = await listConsentSummaries(ctx.db, link.performerId);
  return {
    performerName: performer.name,
    expiresAt: link.expiresAt.toISOString(),
    consents: consents.map((c) => ({ ...c, consequences: withdrawalConsequences(c.kind) })),
  };
}

export async function withdrawByLink(ctx: AppContext, token: string, input: { consentId: string; reason?: string }, req: Request): Promise<void> {
  const link = await linkByToken(ctx.db, token);
  if ((await findConsentPerformer(ctx.db, input.consentId)) !== link.performerId) throw notFound('That consent');
  // The link is the performer's: the withdrawal is recorded as their act, through their sign-in if they have one.
  const owner = await findPerformerScope(ctx.db, link.performerId);
  const done = await withdraw(ctx, req, input.consentId, { reason: input.reason, by: owner?.userId ?? null, byPerformer: link.performerId, via: 'link' });
  await ctx.db.transaction().execute((trx) => markWithdrawalLinkUsed(trx, link.id));
  await sendWithdrawalConfirmation(ctx, done.performerId, done.kind, done.productionId);
  await sendWithdrawalNotices(ctx, input.consentId);
}
