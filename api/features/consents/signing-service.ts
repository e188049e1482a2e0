import { randomUUID } from 'node:crypto';
import { CONSENT_KIND_LABELS, expiryFor } from '#shared/domain/consent.ts';
import { answersSchemaFor, formatAnswer, isMedicalAnswer, type Question } from '#shared/domain/questionnaire.ts';
import { fieldErrorsFromIssues } from '#shared/errors.ts';
import type { SubmitSignatureInput } from '#shared/schemas/consents.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { discardFiles, type FileStore, sha256Hex, storeFile, type StoredFile } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { conflict, invalid, isUniqueViolation } from '../../http/errors.ts';
import { renderConsentPdf } from './pdf.ts';
import { contentSha256, type SignedContent } from './record.ts';
import { findConsentByIdempotencyKey, insertConsent } from './consent-repo.ts';
import { lockRequestStatus, markRequestSigned } from './request-repo.ts';
import { findTemplateVersion, isTemplateSendable, type TemplateVersionRow } from './template-repo.ts';
import { acceptSignature } from './signature.ts';
import { findConfirmedEmail, findPerformerScope } from '../performers/index.ts';
import { departmentInWords, findDepartment, findProductionName, mailFooter } from '../productions/index.ts';
import { mailDate } from '../../mail/dates.ts';

export interface SignedConsentParams {
  performerId: string;
  productionId: string | null;
  requestId: string | null;
  template: TemplateVersionRow;
  answers: Record<string, boolean | string | undefined>;
  signerName: string;
  signaturePng: Buffer;
  signedAt: Date;
  /** The studio's clock (TIME_ZONE), for the signing time written in words on the PDF. */
  timeZone: string;
  signingMethod: 'tablet' | 'link';
  ip: string | null;
  userAgent: string | null;
  staffUserId: string | null;
  idempotencyKey: string;
}

/**
 * Freezes one signing: renders the PDF, stores signature and PDF, and writes the consent and its
 * answers in one transaction. Files written before a failed transaction are removed again.
 */
export async function writeSignedConsent(db: Db, store: FileStore, p: SignedConsentParams): Promise<{ consentId: string; pdf: Buffer; pdfSha256: string }> {
  const performer = await findPerformerScope(db, p.performerId);
  if (!performer) throw new Error('performer vanished while signing');
  const productionName = p.productionId ? await findProductionName(db, p.productionId) : null;
  const consentId = randomUUID();
  const answers = p.template.questions.map((q: Question) => ({
    questionId: q.id,
    label: q.label,
    medical: isMedicalAnswer(p.template.kind, q.medical),
    answer: p.answers[q.id] ?? null,
  }));
  const content: SignedContent = {
    consentId,
    performerId: p.performerId,
    performerName: performer.name,
    templateVersionId: p.template.versionId,
    templateVersion: p.template.version,
    kind: p.template.kind,
    title: p.template.title,
    body: p.template.body,
    answers,
    signerName: p.signerName,
    signedAt: p.signedAt.toISOString(),
    signingMethod: p.signingMethod,
    ip: p.ip,
    userAgent: p.userAgent,
    signatureSha256: sha256Hex(p.signaturePng),
  };
  const hash = contentSha256(content);
  const rendering = {
    consentId,
    kind: p.template.kind,
    title: p.template.title,
    templateVersion: p.template.version,
    body: p.template.body,
    performerName: performer.name,
    productionName,
    answers: p.template.questions.map((q) => ({ label: q.label, answer: formatAnswer(q, p.answers[q.id]), medical: isMedicalAnswer(p.template.kind, q.medical) })),
    signerName: p.signerName,
    signedAt: p.signedAt,
    timeZone: p.timeZone,
    signingMethod: p.signingMethod,
    ip: p.ip,
    userAgent: p.userAgent,
    signaturePng: p.signaturePng,
    contentSha256: hash,
  };
  // The staff copy is rendered when first asked for (staff-copy.ts), so signing and seeding render one PDF.
  const pdf = await renderConsentPdf(rendering);

  const written: StoredFile[] = [];
  try {
    await db.transaction().execute(async (trx) => {
      if (p.requestId && (await lockRequestStatus(trx, p.requestId)) !== 'open') throw new RequestNotOpen();
      const sig = await storeFile(trx, store, { purpose: 'signature', contentType: 'image/png', ext: 'png', bytes: p.signaturePng, createdBy: p.staffUserId });
      written.push(sig);
      // A copy that carries health answers is sealed at rest like the answers themselves.
      const file = await storeFile(trx, store, { purpose: 'consent_pdf', contentType: 'application/pdf', ext: 'pdf', bytes: pdf, createdBy: p.staffUserId, sealed: answers.some((a) => a.medical) });
      written.push(file);
      await insertConsent(
        trx,
        {
          id: consentId,
          performerId: p.performerId,
          productionId: p.productionId,
          templateVersionId: p.template.versionId,
          kind: p.template.kind,
          requestId: p.requestId,
          idempotencyKey: p.idempotencyKey,
          signerName: p.signerName,
          signedAt: p.signedAt,
          expiresAt: expiryFor(p.signedAt, p.template.validityDays),
          signingMethod: p.signingMethod,
          ip: p.ip,
          userAgent: p.userAgent,
          staffUserId: p.staffUserId,
          signatureFileId: sig.id,
          pdfFileId: file.id,
          pdfSha256: file.sha256,
          contentSha256: hash,
        },
        answers,
      );
      if (p.requestId) await markRequestSigned(trx, p.requestId, p.signedAt);
      await writeAudit(trx, {
        actorUserId: p.staffUserId,
        action: 'consent.sign',
        entityType: 'consent',
        entityId: consentId,
        productionId: p.productionId,
        details: { performerId: p.performerId, kind: p.template.kind, templateVersion: p.template.version, method: p.signingMethod },
      });
    });
  } catch (err) {
    await discardFiles(store, written);
    throw err;
  }
  return { consentId, pdf, pdfSha256: written[1]!.sha256 };
}

export class RequestNotOpen extends Error {
  constructor() {
    super('signing request is no longer open');
  }
}

export interface OpenRequest {
  id: string;
  performerId: string;
  productionId: string | null;
  templateId: string;
  status: 'open' | 'signed' | 'cancelled';
  expiresAt: Date;
}


/**
 * A signing submitted from the tablet or a link. The same idempotency key answers with the
 * consent already made (a double tap or a retry), never a second one.
 */
export async function submitSignature(
  ctx: AppContext,
  request: OpenRequest,
  input: SubmitSignatureInput,
  meta: { ip: string | null; userAgent: string | null; method: 'tablet' | 'link'; staffUserId: string | null },
): Promise<{ consentId: string; signedAt: string; emailedTo: string | null; duplicate: boolean }> {
  const earlier = await findConsentByIdempotencyKey(ctx.db, input.idempotencyKey);
  if (earlier) {
    if (earlier.requestId !== request.id) throw conflict('This submission key was already used for another form.');
    return { consentId: earlier.id, signedAt: earlier.signedAt.toISOString(), emailedTo: null, duplicate: true };
  }
  if (request.status === 'signed') throw conflict('This form has already been signed.', { reason: 'signed' });
  if (request.status === 'cancelled') throw conflict('This signing request was withdrawn by the department.', { reason: 'cancelled' });
  if (request.expiresAt.getTime() <= Date.now()) throw conflict('This signing request has expired. Ask the department for a new one.', { reason: 'expired' });

  if (!(await isTemplateSendable(ctx.db, request.templateId))) {
    throw conflict('The department took this form out of use after sending it, so it can no longer be signed. Nothing was saved.', { reason: 'archived' });
  }
  const template = await findTemplateVersion(ctx.db, input.templateVersionId);
  // The performer signs the version they were shown, even if the template was edited meanwhile.
  if (!template || template.templateId !== request.templateId) throw invalid({ templateVersionId: ['This is not a version of the requested form.'] });
  const parsed = answersSchemaFor(template.questions).safeParse(input.answers);
  if (!parsed.success) {
    const fields = fieldErrorsFromIssues(parsed.error.issues);
    throw invalid(Object.fromEntries(Object.entries(fields).map(([k, v]) => [k ? `answers.${k}` : 'answers', v])), 'Some answers need attention.');
  }
  const signature = await acceptSignature(input.signaturePng);

  const signedAt = new Date();
  let result: { consentId: string; pdf: Buffer };
  try {
    result = await writeSignedConsent(ctx.db, ctx.files, {
      performerId: request.performerId,
      productionId: request.productionId,
      requestId: request.id,
      template,
      answers: parsed.data as Record<string, boolean | string | undefined>,
      signerName: input.signerName,
      signaturePng: signature.png,
      signedAt,
      timeZone: ctx.config.timeZone,
      signingMethod: meta.method,
      ip: meta.ip,
      userAgent: meta.userAgent,
      staffUserId: meta.staffUserId,
      idempotencyKey: input.idempotencyKey,
    });
  } catch (err) {
    // Two identical submissions racing: the loser finds the winner's consent.
    if (err instanceof RequestNotOpen || isUniqueViolation(err)) {
      const winner = await findConsentByIdempotencyKey(ctx.db, input.idempotencyKey);
      if (winner) return { consentId: winner.id, signedAt: winner.signedAt.toISOString(), emailedTo: null, duplicate: true };
      throw conflict('This form has already been signed.');
    }
    throw err;
  }
  const emailedTo = await sendConsentCopy(ctx, request.performerId, template, result.pdf, result.consentId, request.productionId);
  return { consentId: result.consentId, signedAt: signedAt.toISOString(), emailedTo, duplicate: false };
}

/** E-mails the performer their signed copy; a failed send is logged and does not undo the signing. */
export async function sendConsentCopy(ctx: AppContext, performerId: string, template: Pick<TemplateVersionRow, 'title' | 'kind'>, pdf: Buffer, consentId: string, productionId: string | null = null): Promise<string | null> {
  // The copy carries the answers: it goes only to an address the performer confirmed as theirs.
  const performer = await findConfirmedEmail(ctx.db, performerId);
  if (!performer) return null;
  const dep = await findDepartment(ctx.db, productionId);
  const { failed } = await deliverAll(ctx, [
    {
      to: performer.email,
      subject: `Your signed consent: ${template.title}${dep.productionName ? ` (${dep.productionName})` : ''}`,
      text: [
        `Hello ${performer.name},`,
        '',
        `Attached is your copy of the ${CONSENT_KIND_LABELS[template.kind].toLowerCase()} consent you signed with ${departmentInWords(dep)} on ${mailDate(new Date(), ctx.config.timeZone)}.`,
        'You can withdraw it at any time, as easily as you gave it: ask the department, or sign in to Plinth, or request a withdrawal link at',
        `${ctx.config.appOrigin}/withdraw`,
        '',
        'Keep this e-mail: the PDF carries a fingerprint (SHA-256) that the department can check against its records.',
        ...mailFooter(dep),
      ].join('\n'),
      attachments: [{ filename: `consent-${consentId}.pdf`, content: pdf, contentType: 'application/pdf' }],
    },
  ]);
  return failed.length ? null : performer.email;
}
