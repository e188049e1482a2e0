import { z } from 'zod';
import { SKIN_CHECK_OUTCOMES } from '../domain/applications.ts';
import { CheckItemViewSchema } from './checks.ts';
import { CalendarDateSchema, IdSchema, MomentInputSchema, VersionSchema } from './common.ts';

/*
 * The application log: what was put on a performer, with which lots, when, and how it came off; the
 * skin check after removal; and the incident anything but clear opens for the lead. The skin check's
 * outcome and observation and the incident's details are health data: only the lead and the
 * performer read them.
 */

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));

export const ProductLotInputSchema = z.object({
  productId: z.uuid({ message: 'Choose the product' }),
  lotId: z.uuid({ message: 'Choose the lot' }),
});
export type ProductLotInput = z.infer<typeof ProductLotInputSchema>;

export const LogApplicationInputSchema = z.object({
  checkId: z.uuid({ message: 'Run the check first' }),
  appliedOn: CalendarDateSchema,
  description: optionalText(500),
  products: z.array(ProductLotInputSchema, { error: 'List the products with their lots' }).min(1, 'List at least one product with its lot').max(80, 'At most 80 products'),
  removalProducts: z.array(ProductLotInputSchema).max(20, 'At most 20 removal products').default([]),
  pieceIds: z.array(z.uuid({ message: 'Choose an appliance piece' })).max(20, 'At most 20 pieces').default([]),
  startedAt: MomentInputSchema,
  endedAt: MomentInputSchema.nullable().optional(),
  notes: optionalText(2000),
});
export type LogApplicationInput = z.input<typeof LogApplicationInputSchema>;

export const FinishApplicationInputSchema = z.object({
  endedAt: MomentInputSchema,
  removalProducts: z.array(ProductLotInputSchema).max(20, 'At most 20 removal products').default([]),
  version: VersionSchema,
});
export type FinishApplicationInput = z.input<typeof FinishApplicationInputSchema>;

export const SkinCheckInputSchema = z
  .object({
    outcome: z.enum(SKIN_CHECK_OUTCOMES, { message: 'Choose clear, redness or reaction' }),
    observation: optionalText(4000),
  })
  .superRefine((v, ctx) => {
    if (v.outcome !== 'clear' && !v.observation) ctx.addIssue({ code: 'custom', path: ['observation'], message: 'Describe what you see' });
  });
export type SkinCheckInput = z.input<typeof SkinCheckInputSchema>;

export const ApplicationProductSchema = z.object({
  productId: z.string(),
  productName: z.string(),
  lotId: z.string(),
  lotCode: z.string(),
  formulationId: z.string(),
});

/** What production staff see of the skin check and any incident; outcome and observation only for the lead and performer. */
export const SkinCheckViewSchema = z.object({
  checkedAt: z.string(),
  checkedByName: z.string().nullable(),
  /** Sent to the lead: true when the check was anything but clear. */
  reportSent: z.boolean(),
  outcome: z.enum(SKIN_CHECK_OUTCOMES).nullable(),
  observation: z.string().nullable(),
});

export const ApplicationSchema = z.object({
  id: z.string(),
  productionId: z.string(),
  performerId: z.string(),
  performerName: z.string(),
  artistName: z.string().nullable(),
  appliedOn: z.string(),
  description: z.string().nullable(),
  startedAt: z.string(),
  endedAt: z.string().nullable(),
  notes: z.string().nullable(),
  products: z.array(ApplicationProductSchema),
  removalProducts: z.array(ApplicationProductSchema),
  pieces: z.array(z.object({ id: z.string(), number: z.number().int(), buildId: z.string() })),
  check: z.object({ id: z.string(), runAt: z.string(), verdict: z.enum(['go', 'stop']), message: z.string(), items: z.array(CheckItemViewSchema) }),
  skinCheck: SkinCheckViewSchema.nullable(),
  version: z.number().int(),
  canFinish: z.boolean(),
  canSkinCheck: z.boolean(),
});
export type Application = z.infer<typeof ApplicationSchema>;

export const ApplicationListQuerySchema = z.object({
  productionId: IdSchema,
  day: CalendarDateSchema.optional(),
  performerId: IdSchema.optional(),
});

export const ApplicationListItemSchema = ApplicationSchema.pick({
  id: true,
  performerId: true,
  performerName: true,
  artistName: true,
  appliedOn: true,
  description: true,
  startedAt: true,
  endedAt: true,
}).extend({ skinChecked: z.boolean() });
export const ApplicationListSchema = z.object({ items: z.array(ApplicationListItemSchema) });

export const IncidentSchema = z.object({
  id: z.string(),
  applicationId: z.string(),
  productionId: z.string(),
  performerId: z.string(),
  performerName: z.string(),
  reportedAt: z.string(),
  reportedByName: z.string().nullable(),
  status: z.enum(['open', 'closed']),
  outcome: z.enum(SKIN_CHECK_OUTCOMES),
  observation: z.string().nullable(),
  products: z.array(ApplicationProductSchema),
  removalProducts: z.array(ApplicationProductSchema),
  closedAt: z.string().nullable(),
  closingNote: z.string().nullable(),
  version: z.number().int(),
});
export type Incident = z.infer<typeof IncidentSchema>;
export const IncidentListSchema = z.object({ items: z.array(IncidentSchema) });
export const IncidentListQuerySchema = z.object({ productionId: IdSchema, status: z.enum(['open', 'closed']).optional() });
export const CloseIncidentInputSchema = z.object({
  note: z.string({ error: 'Write a note for the record' }).trim().min(1, 'Write a note for the record').max(4000, 'At most 4000 characters'),
  version: VersionSchema,
});

export const LotTraceSchema = z.object({
  lot: z.object({ id: z.string(), code: z.string(), productId: z.string(), productName: z.string(), expiresOn: z.string() }),
  /** Whether the skin-check outcomes and observations are shown (the lead); otherwise null in each row. */
  medical: z.boolean(),
  applications: z.array(
    z.object({
      applicationId: z.string(),
      productionId: z.string(),
      performerId: z.string(),
      performerName: z.string(),
      appliedOn: z.string(),
      use: z.enum(['applied', 'removal', 'in_appliance']),
      artistName: z.string().nullable(),
      reportSent: z.boolean(),
      outcome: z.enum(SKIN_CHECK_OUTCOMES).nullable(),
      observation: z.string().nullable(),
    }),
  ),
  performers: z.array(z.object({ id: z.string(), name: z.string(), applications: z.number().int() })),
});
export type LotTrace = z.infer<typeof LotTraceSchema>;
