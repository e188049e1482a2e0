import { z } from 'zod';
import { OVERRIDE_STATES, CLEARANCE_STATES } from '../domain/clearance.ts';
import { ICDRG_CODES, normaliseIcdrgCode } from '../domain/icdrg.ts';
import { ALLERGEN_GROUPS, isValidCas } from '../domain/ingredients.ts';
import { protocolProblems, READING_ANCHORS, TEST_KINDS, type Protocol } from '../domain/protocols.ts';

/** An ICDRG code; `+?` and `±` are read as `?+`, and case and spacing do not matter. */
export const IcdrgCodeSchema = z.preprocess(
  (v) => (typeof v === 'string' ? (normaliseIcdrgCode(v) ?? v) : v),
  z.enum(ICDRG_CODES, { message: 'Use one of -, ?+, +, ++, +++, IR, NT' }),
);

export const TestKindSchema = z.enum(TEST_KINDS, { message: 'Choose a test kind' });
export const ClearanceStateSchema = z.enum(CLEARANCE_STATES);
export const AllergenGroupSchema = z.enum(ALLERGEN_GROUPS, { message: 'Choose an allergen group' });

const minutes = (max: number) => z.number().int('Whole minutes').min(0, 'Cannot be negative').max(max);
const SIXTY_DAYS = 60 * 24 * 60;

export const ReadingPointSchema = z.object({
  id: z.string(),
  label: z.string().trim().min(1, 'Enter a label').max(60),
  from: z.enum(READING_ANCHORS),
  offsetMinutes: minutes(SIXTY_DAYS),
  opensBeforeMinutes: minutes(SIXTY_DAYS),
  closesAfterMinutes: minutes(SIXTY_DAYS),
  optional: z.boolean(),
});

/** A protocol as the head edits it; every rule of `protocolProblems` is reported against its field. */
export const ProtocolSchema = z
  .object({
    id: z.string().regex(/^[a-z0-9-]{1,60}$/, 'Use lower-case letters, digits and - (at most 60)'),
    name: z.string().trim().min(1, 'Enter a name').max(120),
    kind: TestKindSchema,
    description: z.string().trim().max(2000),
    occlusionMinutes: minutes(7 * 24 * 60).nullable(),
    applications: z.object({
      timesPerDay: z.number().int().min(1).max(6),
      days: z.number().int().min(1).max(60),
      sameSite: z.boolean(),
    }),
    readings: z.array(ReadingPointSchema).min(1, 'Add at least one reading').max(40),
  })
  .superRefine((p, ctx) => {
    for (const problem of protocolProblems(p as Protocol)) ctx.addIssue({ code: 'custom', path: problem.path, message: problem.message });
  });

export const CasNumberSchema = z
  .string()
  .trim()
  .refine(isValidCas, { message: 'Not a valid CAS number (form 1234-56-7, with a matching check digit)' });

export const IngredientSchema = z.object({
  inci: z.string().trim().min(1, 'Enter the INCI name').max(200),
  synonyms: z.array(z.string().trim().min(1).max(200)).max(40),
  cas: CasNumberSchema.nullable(),
  group: AllergenGroupSchema,
  trivial: z.boolean(),
});

/** The lead's override of a computed clearance: a note is required and stays with the medical record. */
export const ClearanceOverrideInputSchema = z.object({
  state: z.enum(OVERRIDE_STATES, { message: 'Choose the state to set' }),
  note: z.string().trim().min(1, 'Explain the decision in a note').max(2000, 'At most 2,000 characters'),
  expiresAt: z.coerce.date().nullable().optional(),
});
