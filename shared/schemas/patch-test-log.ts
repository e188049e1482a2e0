import { z } from 'zod';
import { CLEARANCE_STATES, OVERRIDE_STATES } from '../domain/clearance.ts';
import { ICDRG_CODES } from '../domain/icdrg.ts';
import { TEST_STATUSES } from '../domain/reading-schedule.ts';
import { READING_PATTERNS } from '../domain/test-outcome.ts';
import { TEST_SITES } from '../domain/test-sites.ts';
import { IdSchema, MomentInputSchema, pagedSchema, VersionSchema } from './common.ts';
import { IcdrgCodeSchema, TestKindSchema } from './patch-tests.ts';

export const TestSiteSchema = z.enum(TEST_SITES, { message: 'Choose a test site from the list' });

export const TestedProductInputSchema = z.object({ productId: IdSchema, lotId: IdSchema, site: TestSiteSchema });

export const BookPatchTestInputSchema = z
  .object({
    performerId: IdSchema,
    productionId: IdSchema,
    protocolId: z.string().regex(/^[a-z0-9-]{1,60}$/, 'Choose a protocol'),
    startsAt: MomentInputSchema,
    /** When the application session ends; without one it is booked for the usual length. */
    endsAt: MomentInputSchema.optional(),
    location: z.string().trim().min(1, 'Enter where the test takes place').max(200),
    products: z.array(TestedProductInputSchema).min(1, 'Add at least one product').max(24, 'At most 24 products on one test'),
  })
  .superRefine((v, ctx) => {
    const seen = new Set<string>();
    v.products.forEach((p, i) => {
      if (seen.has(p.site)) ctx.addIssue({ code: 'custom', path: ['products', i, 'site'], message: 'Each product needs its own site' });
      seen.add(p.site);
    });
  });
export type BookPatchTestInput = z.infer<typeof BookPatchTestInputSchema>;

export const RescheduleInputSchema = z.object({ startsAt: MomentInputSchema, location: z.string().trim().min(1, 'Enter where the test takes place').max(200), version: VersionSchema });
export const VersionedInputSchema = z.object({ version: VersionSchema });
export const ApplyInputSchema = z.object({ appliedAt: MomentInputSchema, version: VersionSchema });
export const RemovalInputSchema = z.object({ removedAt: MomentInputSchema, version: VersionSchema });

/** One point's readings for the whole grid, recorded together. */
export const ReadingsInputSchema = z.object({
  pointId: z.string().min(1).max(60),
  readAt: MomentInputSchema,
  sites: z
    .array(z.object({ testProductId: IdSchema, code: IcdrgCodeSchema, note: z.string().trim().max(2000, 'At most 2,000 characters').optional() }))
    .min(1, 'Grade at least one site'),
  version: VersionSchema,
});
export type ReadingsInput = z.infer<typeof ReadingsInputSchema>;

export const OverrideInputSchema = z.object({
  formulationId: IdSchema,
  state: z.enum(OVERRIDE_STATES, { message: 'Choose the state to set' }),
  note: z.string().trim().min(1, 'Explain the decision in a note').max(2000, 'At most 2,000 characters'),
  expiresAt: MomentInputSchema.nullable().optional(),
});
export type OverrideInput = z.infer<typeof OverrideInputSchema>;

export const PhotoParamsSchema = z.object({ id: IdSchema, photoId: IdSchema });
export const ReadingParamsSchema = z.object({ id: IdSchema, readingId: IdSchema });
export const PhotoQuerySchema = z.object({ size: z.enum(['photo', 'thumbnail']).default('thumbnail') });
export const PatchTestListQuerySchema = z.object({ productionId: IdSchema, status: z.enum(TEST_STATUSES).optional() });

const iso = z.iso.datetime();

export const ScheduledReadingSchema = z.object({
  pointId: z.string(),
  label: z.string(),
  optional: z.boolean(),
  dueAt: iso,
  opensAt: iso,
  closesAt: iso,
  dayLabel: z.string(),
  estimated: z.boolean(),
  status: z.enum(['not_open', 'open', 'overdue', 'lapsed', 'done']),
});

/** A reading as the lead and the performer see it: the code, note and photos are health details. */
export const ReadingDetailSchema = z.object({
  id: IdSchema,
  pointId: z.string(),
  readAt: iso,
  late: z.boolean(),
  code: z.enum(ICDRG_CODES),
  note: z.string().nullable(),
  readBy: z.string().nullable(),
  photos: z.array(z.object({ id: IdSchema, width: z.number(), height: z.number() })),
});

export const TestedProductSchema = z.object({
  id: IdSchema,
  productId: IdSchema,
  productName: z.string(),
  lotId: IdSchema,
  lotCode: z.string(),
  formulationId: IdSchema,
  site: z.string(),
  /** Points read at this site: anyone who reads the test sees that a reading was taken, never what it was. */
  readPointIds: z.array(z.string()),
  /** Health details: only for the lead and the performer. */
  readings: z.array(ReadingDetailSchema).optional(),
  outcome: z.object({ strongest: z.enum(ICDRG_CODES).nullable(), final: z.enum(ICDRG_CODES).nullable(), pattern: z.enum(READING_PATTERNS) }).optional(),
});

export const PatchTestSummarySchema = z.object({
  id: IdSchema,
  performerId: IdSchema,
  performerName: z.string(),
  productionId: IdSchema,
  protocolName: z.string(),
  testKind: TestKindSchema,
  status: z.enum(TEST_STATUSES),
  startsAt: iso,
  location: z.string().nullable(),
  appliedAt: iso.nullable(),
  removedAt: iso.nullable(),
  closedAt: iso.nullable(),
  /** No active patch-testing consent for this production when the test starts: it waits for one. */
  consentMissing: z.boolean(),
  productCount: z.number().int(),
  version: z.number().int(),
});
export type PatchTestSummary = z.infer<typeof PatchTestSummarySchema>;

export const PatchTestDetailSchema = PatchTestSummarySchema.extend({
  protocolVersionId: IdSchema,
  schedule: z.array(ScheduledReadingSchema),
  products: z.array(TestedProductSchema),
  /** Whether health details are included (the viewer is the lead or the performer). */
  medical: z.boolean(),
});
export type PatchTestDetail = z.infer<typeof PatchTestDetailSchema>;
export const PatchTestListSchema = z.object({ items: z.array(PatchTestSummarySchema) });

export const ClearanceRowSchema = z.object({
  productId: IdSchema,
  productName: z.string(),
  formulationId: IdSchema,
  state: z.enum(CLEARANCE_STATES),
  reasons: z.array(z.object({ code: z.string(), text: z.string() })),
  validUntil: iso.nullable(),
  retestAdvised: z.boolean(),
  overridden: z.boolean(),
  override: z.object({ state: z.enum(OVERRIDE_STATES), by: z.string(), at: iso, note: z.string().optional() }).nullable(),
  computedState: z.enum(CLEARANCE_STATES),
  /** Health details, only for the lead and the performer: the latest test's strongest and final codes and pattern. */
  outcome: z.object({ strongest: z.enum(ICDRG_CODES).nullable(), final: z.enum(ICDRG_CODES).nullable(), pattern: z.enum(READING_PATTERNS) }).optional(),
});
export type ClearanceRow = z.infer<typeof ClearanceRowSchema>;

/**
 * Products that are Caution for this performer only because they share a non-trivial ingredient with a
 * product that reacted: on a large catalogue these run to thousands, so they come a page at a time,
 * by product name, apart from the table of what was tested, decided or declared.
 */
export const SHARED_CAUTIONS_PAGE_SIZE = 25;
/** A performer's tests, newest first, come a page at a time: a long-serving performer can have hundreds. */
export const TEST_TIMELINE_PAGE_SIZE = 20;
const pageNumber = z.coerce.number({ error: 'Give a page number' }).int('Give a whole page number').min(1, 'Pages start at 1').max(100_000, 'No such page').default(1);
export const PerformerPatchTestsQuerySchema = z.object({
  sharedPage: pageNumber,
  testsPage: pageNumber,
});
export type PerformerPatchTestsQuery = z.infer<typeof PerformerPatchTestsQuerySchema>;

export const PerformerPatchTestsSchema = z.object({
  /** The performer's tests, newest first, a page at a time (`TEST_TIMELINE_PAGE_SIZE`). */
  tests: pagedSchema(PatchTestSummarySchema),
  /** Every product tested on the performer, decided by the lead, or matching a declared allergy. */
  clearances: z.array(ClearanceRowSchema),
  sharedCautions: pagedSchema(ClearanceRowSchema),
  medical: z.boolean(),
  canBook: z.boolean(),
  canOverride: z.boolean(),
});
export type PerformerPatchTests = z.infer<typeof PerformerPatchTestsSchema>;
