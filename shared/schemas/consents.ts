import { z } from 'zod';
import { CONSENT_KINDS } from '../domain/consent.ts';
import { QuestionsSchema } from '../domain/questionnaire.ts';
import { IdSchema, VersionSchema } from './common.ts';

export const ConsentKindSchema = z.enum(CONSENT_KINDS, { message: 'Choose a consent kind' });
export const ConsentStateSchema = z.enum(['active', 'expired', 'withdrawn']);

// ---- templates
const templateFields = {
  kind: ConsentKindSchema,
  title: z.string().trim().min(1, 'Enter a title').max(200, 'At most 200 characters'),
  body: z.string().trim().min(20, 'The consent text needs at least 20 characters').max(40_000, 'At most 40,000 characters'),
  questions: QuestionsSchema.default([]),
  validityDays: z.number().int().min(1, 'At least 1 day').max(3650, 'At most 10 years').nullable(),
};
export const CreateTemplateInputSchema = z.object(templateFields);
export type CreateTemplateInput = z.infer<typeof CreateTemplateInputSchema>;
export const UpdateTemplateInputSchema = z.object({ ...templateFields, version: VersionSchema.describe('The version the editor started from') });
export type UpdateTemplateInput = z.infer<typeof UpdateTemplateInputSchema>;

export const TemplateSchema = z.object({
  id: IdSchema,
  versionId: IdSchema,
  kind: ConsentKindSchema,
  version: z.number().int(),
  title: z.string(),
  body: z.string(),
  questions: QuestionsSchema,
  validityDays: z.number().int().nullable(),
  archived: z.boolean(),
  updatedAt: z.iso.datetime(),
  signedCount: z.number().int(),
});
export type Template = z.infer<typeof TemplateSchema>;
export const TemplateListSchema = z.object({ items: z.array(TemplateSchema) });
export const TemplateVersionListSchema = z.object({
  items: z.array(z.object({ versionId: IdSchema, version: z.number().int(), title: z.string(), createdAt: z.iso.datetime(), createdBy: z.string().nullable() })),
});
export type TemplateVersionList = z.infer<typeof TemplateVersionListSchema>;

// ---- signing requests
export const CreateSigningRequestInputSchema = z.object({
  performerId: IdSchema,
  templateId: IdSchema,
  productionId: IdSchema,
  mode: z.enum(['tablet', 'link'], { message: 'Choose tablet or link' }),
});
export type CreateSigningRequestInput = z.infer<typeof CreateSigningRequestInputSchema>;

export const SigningRequestSchema = z.object({
  id: IdSchema,
  mode: z.enum(['tablet', 'link']),
  status: z.enum(['open', 'signed', 'cancelled', 'expired']),
  expiresAt: z.iso.datetime(),
  createdAt: z.iso.datetime(),
  performer: z.object({ id: IdSchema, name: z.string() }),
  template: z.object({ id: IdSchema, title: z.string(), kind: ConsentKindSchema }),
  sentTo: z.string().nullable(),
});
export type SigningRequest = z.infer<typeof SigningRequestSchema>;
export const SigningRequestListSchema = z.object({ items: z.array(SigningRequestSchema) });

/** What the signing screen shows: the exact text and questions of one template version. */
export const SigningFormSchema = z.object({
  requestId: IdSchema,
  performerName: z.string(),
  productionName: z.string().nullable(),
  expiresAt: z.iso.datetime(),
  template: z.object({
    versionId: IdSchema,
    version: z.number().int(),
    kind: ConsentKindSchema,
    title: z.string(),
    body: z.string(),
    questions: QuestionsSchema,
    validityDays: z.number().int().nullable(),
  }),
});
export type SigningForm = z.infer<typeof SigningFormSchema>;

export const HandOverResultSchema = z.object({ ok: z.literal(true), redirectTo: z.string() });

/** What the lent tablet shows: the form while signing; nothing at all once done. */
export const TabletStateSchema = z.object({
  phase: z.enum(['signing', 'handback', 'none']),
  form: SigningFormSchema.nullable(),
  idempotencyKey: z.uuid().nullable(),
  /** Where this form stands in a bundle handed over at once (absent for a single form). */
  progress: z.object({ position: z.number().int().min(1), total: z.number().int().min(1) }).optional(),
});
export type TabletState = z.infer<typeof TabletStateSchema>;

export const SIGNATURE_MAX_BYTES = 400_000;

export const SubmitSignatureInputSchema = z.object({
  templateVersionId: IdSchema,
  idempotencyKey: z.uuid({ message: 'Missing submission key' }),
  signerName: z.string().trim().min(2, 'Print your full name').max(160),
  agreed: z.literal(true, { message: 'Tick the box to agree, or hand the tablet back if you do not' }),
  answers: z.record(z.string(), z.union([z.boolean(), z.string()])).default({}),
  signaturePng: z
    .string()
    .regex(/^data:image\/png;base64,[A-Za-z0-9+/]+=*$/, 'Sign in the box')
    .max(Math.ceil((SIGNATURE_MAX_BYTES * 4) / 3) + 40, 'The signature image is too large'),
});
export type SubmitSignatureInput = z.infer<typeof SubmitSignatureInputSchema>;

export const SubmitSignatureResultSchema = z.object({
  consentId: IdSchema,
  signedAt: z.iso.datetime(),
  emailedTo: z.string().nullable(),
  /** True when this exact submission had already been received (a retry or double tap). */
  duplicate: z.boolean(),
});

// ---- consents
export const AnswerSchema = z.object({
  questionId: z.string(),
  label: z.string(),
  medical: z.boolean(),
  answer: z.union([z.boolean(), z.string(), z.null()]),
});

export const ConsentSummarySchema = z.object({
  id: IdSchema,
  performerId: IdSchema,
  performerName: z.string(),
  productionId: IdSchema.nullable(),
  kind: ConsentKindSchema,
  title: z.string(),
  templateVersion: z.number().int(),
  signedAt: z.iso.datetime(),
  expiresAt: z.iso.datetime().nullable(),
  state: ConsentStateSchema,
  signerName: z.string(),
  signingMethod: z.enum(['tablet', 'link']),
  withdrawnAt: z.iso.datetime().nullable(),
  version: VersionSchema,
});
export type ConsentSummary = z.infer<typeof ConsentSummarySchema>;

export const ConsentDetailSchema = ConsentSummarySchema.extend({
  body: z.string(),
  answers: z.array(AnswerSchema),
  /** Medical answers exist but this reader may not see them. */
  medicalWithheld: z.boolean(),
  /** Withdrawal reason: shown only to the designated lead and the performer. */
  withdrawalReason: z.string().nullable(),
  withdrawnVia: z.enum(['performer', 'lead', 'link']).nullable(),
  pdfSha256: z.string(),
  contentSha256: z.string(),
  /** The PDF holds the answers, so it is open only to those who may read them. */
  canDownloadPdf: z.boolean(),
  canWithdraw: z.boolean(),
  consequences: z.array(z.string()),
});
export type ConsentDetail = z.infer<typeof ConsentDetailSchema>;

export const ConsentListQuerySchema = z.object({
  performerId: IdSchema.optional(),
  productionId: IdSchema.optional(),
  state: ConsentStateSchema.optional(),
});
export const ConsentListSchema = z.object({ items: z.array(ConsentSummarySchema) });

export const WithdrawResultSchema = ConsentDetailSchema.pick({ id: true, state: true, withdrawnAt: true, version: true });

export const WithdrawInputSchema = z.object({
  reason: z.string().trim().max(1000, 'At most 1,000 characters').optional(),
  version: VersionSchema,
});
export type WithdrawInput = z.infer<typeof WithdrawInputSchema>;

export const WithdrawalLinkRequestedSchema = z.object({ ok: z.literal(true), message: z.string() });
export const RequestWithdrawalLinkInputSchema = z.object({ email: z.email({ message: 'Enter the e-mail address Plinth has for you' }).trim().toLowerCase() });
export const WithdrawalLinkViewSchema = z.object({
  performerName: z.string(),
  expiresAt: z.iso.datetime(),
  consents: z.array(ConsentSummarySchema.extend({ consequences: z.array(z.string()) })),
});

export const VerifyResultSchema = z.object({
  sha256: z.string(),
  match: z.boolean(),
  /** A match on a production the checker does not work on: Plinth issued it, and says no more. */
  elsewhere: z.boolean(),
  /** Which of the consent's two files this is: the full signed copy, or the staff copy without health answers. */
  copy: z.enum(['full', 'staff']).nullable().optional(),
  consent: z
    .object({ id: IdSchema, performerName: z.string(), kind: ConsentKindSchema, title: z.string(), templateVersion: z.number().int(), signedAt: z.iso.datetime(), state: ConsentStateSchema })
    .nullable(),
});
export type VerifyResult = z.infer<typeof VerifyResultSchema>;
