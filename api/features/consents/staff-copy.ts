import type { Request } from 'express';
import { formatAnswer, isMedicalAnswer, QuestionsSchema } from '#shared/domain/questionnaire.ts';
import type { Actor } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import { readStoredFile, storeFile } from '../../files/store.ts';
import { recordEvent } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { findConsentForRendering, findConsentSummary, listConsentAnswers, lockStaffCopySlot, setStaffCopy } from './consent-repo.ts';
import { consentResource } from './consent-service.ts';
import { renderConsentPdf } from './pdf.ts';

/**
 * The staff-safe copy of a consent: the same text, signer, time, signature and content hash as the
 * signed PDF, every health answer withheld. Anyone who may see the consent may have it. It is
 * rendered on first request and kept, so its fingerprint is on record before anyone holds the file.
 */
export async function staffCopyPdf(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Buffer> {
  const summary = await findConsentSummary(ctx.db, id);
  if (!summary) throw notFound('That consent');
  const { resource } = await consentResource(ctx.db, summary.performerId, summary.productionId);
  authorize(actor, 'consents.view', resource);
  const row = await findConsentForRendering(ctx.db, id);
  if (!row) throw notFound('That consent');
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'consent.staff_copy', entityType: 'consent', entityId: id, performerId: summary.performerId, productionId: summary.productionId, req });
  if (row.staff_pdf_file_id) {
    const file = await readStoredFile(ctx.db, ctx.files, row.staff_pdf_file_id);
    if (!file) throw notFound('The staff copy');
    return file.bytes;
  }
  const signature = await readStoredFile(ctx.db, ctx.files, row.signature_file_id);
  if (!signature) throw notFound('The signature');
  const questions = QuestionsSchema.parse(row.questions);
  // Health answers are opened only to be left out; what is rendered carries none of them.
  const answers = (await listConsentAnswers(ctx.db, id)).map((a) => {
    const q = questions.find((x) => x.id === a.questionId);
    const medical = isMedicalAnswer(row.kind, a.medical);
    return { label: a.label, medical, answer: medical ? '' : formatAnswer(q ?? { type: 'short_text' }, a.answer ?? undefined) };
  });
  const bytes = await renderConsentPdf({
    consentId: row.id,
    kind: row.kind,
    title: row.title,
    templateVersion: row.version,
    body: row.body,
    performerName: row.performer_name,
    productionName: row.production_name,
    answers,
    signerName: row.signer_name,
    signedAt: new Date(row.signed_at),
    timeZone: ctx.config.timeZone,
    signingMethod: row.signing_method,
    ip: row.ip,
    userAgent: row.user_agent,
    signaturePng: signature.bytes,
    contentSha256: row.content_sha256,
    staffCopy: true,
  });
  // The copy holds no health answer, so it is stored as it is. Two first requests racing: the first kept wins.
  const kept = await ctx.db.transaction().execute(async (trx) => {
    if (!(await lockStaffCopySlot(trx, id))) return null;
    const file = await storeFile(trx, ctx.files, { purpose: 'consent_staff_pdf', contentType: 'application/pdf', ext: 'pdf', bytes, createdBy: actor.userId });
    await setStaffCopy(trx, id, file);
    return bytes;
  });
  if (kept) return kept;
  const again = await findConsentForRendering(ctx.db, id);
  const file = again?.staff_pdf_file_id ? await readStoredFile(ctx.db, ctx.files, again.staff_pdf_file_id) : null;
  if (!file) throw notFound('The staff copy');
  return file.bytes;
}
