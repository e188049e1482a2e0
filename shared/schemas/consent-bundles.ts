import { z } from 'zod';
import { IdSchema } from './common.ts';
import { ConsentKindSchema, SigningFormSchema, SigningRequestSchema } from './consents.ts';

/** At most this many forms go out in one bundle: more than a sitting's worth is better split. */
export const BUNDLE_MAX_FORMS = 8;

/** Several forms asked for at once: signed one after another on the tablet, or walked through from one e-mailed link. */
export const CreateSigningBundleInputSchema = z.object({
  performerId: IdSchema,
  productionId: IdSchema,
  templateIds: z
    .array(IdSchema)
    .min(1, 'Choose at least one form')
    .max(BUNDLE_MAX_FORMS, `At most ${BUNDLE_MAX_FORMS} forms at once`)
    .refine((ids) => new Set(ids).size === ids.length, 'Choose each form once'),
  mode: z.enum(['tablet', 'link'], { message: 'Choose tablet or link' }),
});
export type CreateSigningBundleInput = z.infer<typeof CreateSigningBundleInputSchema>;

export const SigningBundleSchema = z.object({
  id: IdSchema,
  mode: z.enum(['tablet', 'link']),
  expiresAt: z.iso.datetime(),
  performer: z.object({ id: IdSchema, name: z.string() }),
  /** Where the one link went (link bundles only). */
  sentTo: z.string().nullable(),
  /** One request per form, in the order they are signed. */
  requests: z.array(SigningRequestSchema),
});
export type SigningBundle = z.infer<typeof SigningBundleSchema>;

export const BundleItemStateSchema = z.enum(['to_sign', 'signed', 'unavailable']);

/** What one e-mailed bundle link shows: every form in order, and the ones still to sign with their exact text. */
export const BundleLinkViewSchema = z.object({
  performerName: z.string(),
  productionName: z.string().nullable(),
  expiresAt: z.iso.datetime(),
  items: z.array(
    z.object({
      requestId: IdSchema,
      title: z.string(),
      kind: ConsentKindSchema,
      state: BundleItemStateSchema,
      /** The form to sign; only while it is still to sign. */
      form: SigningFormSchema.nullable(),
    }),
  ),
});
export type BundleLinkView = z.infer<typeof BundleLinkViewSchema>;

export const BundleTokenParamsSchema = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{40,60}$/, 'Not a signing link') });
export const BundleRequestParamsSchema = BundleTokenParamsSchema.extend({ requestId: IdSchema });
