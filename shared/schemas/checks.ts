import { z } from 'zod';
import { CLEARANCE_STATES } from '../domain/clearance.ts';
import { IdSchema } from './common.ts';

/*
 * The artist's check before an application: the products planned (from a kit, one by one, and the
 * materials of the appliance pieces to be worn), answered per product with a state, reasons in plain
 * words and the validity date, and one go or stop. Never a grade, note or answer.
 */

const IdListSchema = (what: string, max: number) =>
  z
    .array(z.uuid({ message: `Choose ${what}` }))
    .max(max, `At most ${max}`)
    .default([])
    .refine((ids) => new Set(ids).size === ids.length, 'Each only once');

export const RunCheckInputSchema = z.object({
  productionId: IdSchema,
  performerId: z.uuid({ message: 'Choose the performer' }),
  /** Products chosen one by one; a kit's products are added to them. */
  productIds: IdListSchema('a product', 80),
  kitId: z.uuid({ message: 'Choose a kit' }).nullable().optional(),
  pieceIds: IdListSchema('an appliance piece', 20),
});
export type RunCheckInput = z.input<typeof RunCheckInputSchema>;

export const ClearanceStateSchema = z.enum(CLEARANCE_STATES);

export const LeadRequestStatusSchema = z.enum(['waiting', 'approved', 'refused']);
export type LeadRequestStatus = z.infer<typeof LeadRequestStatusSchema>;

/** What anyone on the production sees of a request to the lead: its state, never the lead's note. */
export const LeadRequestBriefSchema = z.object({
  id: z.string(),
  status: LeadRequestStatusSchema,
  requestedAt: z.string(),
  decidedAt: z.string().nullable(),
  decidedByName: z.string().nullable(),
});

export const CheckItemSchema = z.object({
  productId: z.string(),
  productName: z.string(),
  formulationId: z.string(),
  state: ClearanceStateSchema,
  reasons: z.array(z.object({ code: z.string(), text: z.string() })),
  validUntil: z.string().nullable(),
  retestAdvised: z.boolean(),
  overridden: z.boolean(),
  /** Chosen by hand or from the kit, or a material of appliance pieces (their ids). */
  fromPieceIds: z.array(z.string()),
});
export type CheckItem = z.infer<typeof CheckItemSchema>;

export const CheckItemViewSchema = CheckItemSchema.extend({
  approved: z.boolean(),
  go: z.boolean(),
  request: LeadRequestBriefSchema.nullable(),
});
export type CheckItemView = z.infer<typeof CheckItemViewSchema>;

export const CheckSchema = z.object({
  id: z.string(),
  productionId: z.string(),
  performerId: z.string(),
  performerName: z.string(),
  kitId: z.string().nullable(),
  runAt: z.string(),
  runByName: z.string().nullable(),
  verdict: z.enum(['go', 'stop']),
  message: z.string(),
  items: z.array(CheckItemViewSchema),
  pieceIds: z.array(z.string()),
  /** Whether this person may ask the lead and log the application. */
  canAskLead: z.boolean(),
  canLog: z.boolean(),
  /** The application logged from this check, if any. */
  applicationId: z.string().nullable(),
  /** Lots in date and in use of each checked formulation, for logging the application. */
  lots: z.array(z.object({ formulationId: z.string(), id: z.string(), code: z.string(), expiresOn: z.string() })),
});
export type Check = z.infer<typeof CheckSchema>;

export const AskLeadInputSchema = z.object({ formulationId: z.uuid({ message: 'Choose the product to ask about' }) });

export const LeadDecisionInputSchema = z.object({
  decision: z.enum(['approved', 'refused'], { message: 'Approve or refuse' }),
  note: z.string({ error: 'Write a note for the record' }).trim().min(1, 'Write a note for the record').max(4000, 'At most 4000 characters'),
  version: z.number().int().min(1),
});
export type LeadDecisionInput = z.infer<typeof LeadDecisionInputSchema>;

/** A request as the lead sees it (with the note once decided: health data). */
export const LeadRequestSchema = z.object({
  id: z.string(),
  checkId: z.string(),
  productionId: z.string(),
  performerId: z.string(),
  performerName: z.string(),
  productId: z.string(),
  productName: z.string(),
  formulationId: z.string(),
  stateAtRequest: z.enum(['caution', 'do_not_use']),
  reasons: z.array(z.object({ code: z.string(), text: z.string() })),
  requestedAt: z.string(),
  requestedByName: z.string().nullable(),
  status: LeadRequestStatusSchema,
  decidedAt: z.string().nullable(),
  decidedByName: z.string().nullable(),
  note: z.string().nullable(),
  version: z.number().int(),
});
export type LeadRequest = z.infer<typeof LeadRequestSchema>;
export const LeadRequestListSchema = z.object({ items: z.array(LeadRequestSchema) });
export const LeadRequestListQuerySchema = z.object({ productionId: IdSchema, status: LeadRequestStatusSchema.optional() });

export const PieceChoiceQuerySchema = z.object({ productionId: IdSchema, performerId: IdSchema });
export const PieceChoiceListSchema = z.object({ items: z.array(z.object({ id: z.string(), number: z.number().int(), buildId: z.string(), madeOn: z.string(), moldLabel: z.string() })) });
