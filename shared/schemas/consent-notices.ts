import { z } from 'zod';
import { BookingSchema } from './bookings.ts';
import { IdSchema } from './common.ts';
import { ConsentKindSchema } from './consents.ts';

export const ConsentNoticeQuerySchema = z.object({ productionId: IdSchema });

/** A consent withdrawn on a production's record, with the upcoming sessions it leaves waiting. */
export const WithdrawalNoticeSchema = z.object({
  consentId: IdSchema,
  performerId: IdSchema,
  performerName: z.string(),
  kind: ConsentKindSchema,
  title: z.string(),
  withdrawnAt: z.iso.datetime(),
  withdrawnVia: z.enum(['performer', 'lead', 'link']).nullable(),
  /** The performer's reason: only for the designated lead (a medical read, audited). */
  reason: z.string().nullable(),
  sessionsAffected: z.array(BookingSchema),
});
export type WithdrawalNotice = z.infer<typeof WithdrawalNoticeSchema>;

export const WithdrawalNoticeListSchema = z.object({
  /** Withdrawals after this moment are listed: when this person last marked them seen (or 30 days back). */
  since: z.iso.datetime(),
  /** When the list was read: marking it seen uses this, so a withdrawal landing meanwhile stays new. */
  readAt: z.iso.datetime(),
  /** Whether reasons are shown at all (the designated lead). */
  reasonsShown: z.boolean(),
  items: z.array(WithdrawalNoticeSchema),
});
export type WithdrawalNoticeList = z.infer<typeof WithdrawalNoticeListSchema>;

export const MarkSeenInputSchema = z.object({ productionId: IdSchema, seenAt: z.iso.datetime({ message: 'Must be a moment' }) });

/** One health answer as the lead reads it: the form and date it was given on. */
export const HealthAnswerSchema = z.object({
  consentId: IdSchema,
  title: z.string(),
  kind: ConsentKindSchema,
  signedAt: z.iso.datetime(),
  questionId: z.string(),
  label: z.string(),
  answer: z.string(),
});
export type HealthAnswer = z.infer<typeof HealthAnswerSchema>;

/** The lead's worklist: per performer, the health answers given since the lead last confirmed having looked. */
export const HealthWorklistSchema = z.object({
  readAt: z.iso.datetime(),
  items: z.array(z.object({ performerId: IdSchema, performerName: z.string(), reviewedAt: z.iso.datetime().nullable(), answers: z.array(HealthAnswerSchema) })),
});
export type HealthWorklist = z.infer<typeof HealthWorklistSchema>;

export const ConfirmHealthReviewInputSchema = z.object({ performerId: IdSchema, productionId: IdSchema, reviewedAt: z.iso.datetime({ message: 'Must be a moment' }) });

/** Every health answer a performer gave, from all their consents the reader may see. */
export const HealthSummarySchema = z.object({ performerId: IdSchema, answers: z.array(HealthAnswerSchema) });
export type HealthSummary = z.infer<typeof HealthSummarySchema>;
export const HealthSummaryQuerySchema = z.object({ performerId: IdSchema });
