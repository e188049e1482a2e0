import { z } from 'zod';
import { CONSENT_KINDS } from '../domain/consent.ts';
import { CalendarDateSchema, IdSchema, VersionSchema, pagedSchema } from './common.ts';
import { BookingSchema } from './bookings.ts';
import { ConsentSummarySchema } from './consents.ts';

const optionalText = (max: number, message = `At most ${max} characters`) =>
  z
    .string()
    .trim()
    .max(max, message)
    .transform((v) => (v === '' ? null : v))
    .nullable()
    .optional()
    .transform((v) => v ?? null);

const DateSchema = CalendarDateSchema;

export const EngagementInputSchema = z
  .object({
    productionId: IdSchema,
    characterName: optionalText(160),
    startsOn: DateSchema.nullable().optional().transform((v) => v ?? null),
    endsOn: DateSchema.nullable().optional().transform((v) => v ?? null),
  })
  .refine((e) => !(e.startsOn && e.endsOn && e.endsOn < e.startsOn), { message: 'The end date is before the start date', path: ['endsOn'] });

/** The editable, non-medical facts about a performer. Health details never live here. */
export const PerformerFieldsSchema = z.object({
  legalName: z.string().trim().min(1, 'Enter the legal name').max(160, 'At most 160 characters'),
  preferredName: optionalText(160),
  pronouns: optionalText(40),
  email: z
    .union([z.email({ message: 'Enter a valid email address' }).trim().toLowerCase().max(254), z.literal('')])
    .nullable()
    .optional()
    .transform((v) => (v ? v : null)),
  phone: optionalText(40),
  emergencyContactName: optionalText(160),
  emergencyContactPhone: optionalText(40),
  agentName: optionalText(160),
  agentContact: optionalText(200),
  notes: optionalText(4000),
});

/** The performer's own fields by name, for code that copies or lists them (client forms, change audits). */
export const PERFORMER_FIELD_KEYS = PerformerFieldsSchema.keyof().options;

export const CreatePerformerInputSchema = PerformerFieldsSchema.extend({
  engagements: z.array(EngagementInputSchema).min(1, 'Engage the performer on at least one production').max(50),
});
export type CreatePerformerInput = z.infer<typeof CreatePerformerInputSchema>;
export const UpdatePerformerInputSchema = CreatePerformerInputSchema.extend({ version: VersionSchema });
export type UpdatePerformerInput = z.infer<typeof UpdatePerformerInputSchema>;

/**
 * Staff may only unlink a sign-in. Linking is the performer's own act: accepting an invitation
 * sent to their confirmed address, or signing in with that confirmed address.
 */
export const LinkAccountInputSchema = z.object({
  userId: z.null({ message: 'Staff can only unlink a sign-in. To link one, send the performer an invitation to their confirmed address.' }),
  version: VersionSchema,
});

export const PERFORMER_CONSENT_FILTERS = ['any', 'complete', 'incomplete', 'expiring', 'withdrawn'] as const;
export const PERFORMER_CONSENT_FILTER_LABELS: Record<(typeof PERFORMER_CONSENT_FILTERS)[number], string> = {
  any: 'Any consent status',
  complete: 'Every kind active',
  incomplete: 'Missing a kind',
  expiring: 'Expiring within 30 days',
  withdrawn: 'Has a withdrawn consent',
};

export const PerformerListQuerySchema = z.object({
  q: z.string().trim().max(200).optional(),
  productionId: IdSchema.optional(),
  consent: z.enum(PERFORMER_CONSENT_FILTERS).default('any'),
  sort: z.enum(['name', 'createdAt']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type PerformerListQuery = z.infer<typeof PerformerListQuerySchema>;

export const EngagementSchema = z.object({
  productionId: IdSchema,
  productionName: z.string(),
  characterName: z.string().nullable(),
  startsOn: z.string().nullable(),
  endsOn: z.string().nullable(),
});

export const PerformerListItemSchema = z.object({
  id: IdSchema,
  legalName: z.string(),
  preferredName: z.string().nullable(),
  pronouns: z.string().nullable(),
  engagements: z.array(EngagementSchema),
  activeKinds: z.array(z.enum(CONSENT_KINDS)),
  expiringSoon: z.number().int(),
  withdrawn: z.number().int(),
  thumbnailUrl: z.string().nullable(),
});
export type PerformerListItem = z.infer<typeof PerformerListItemSchema>;
export const PerformerPageSchema = pagedSchema(PerformerListItemSchema);

/** Contact details go to those who manage performers and to the performer; others get null. */
export const PerformerDetailSchema = z.object({
  id: IdSchema,
  legalName: z.string(),
  preferredName: z.string().nullable(),
  pronouns: z.string().nullable(),
  contact: z
    .object({
      email: z.string().nullable(),
      /** Whether the performer confirmed the address; until then it gets only the confirmation request. */
      emailConfirmed: z.boolean(),
      phone: z.string().nullable(),
      emergencyContactName: z.string().nullable(),
      emergencyContactPhone: z.string().nullable(),
      agentName: z.string().nullable(),
      agentContact: z.string().nullable(),
      notes: z.string().nullable(),
    })
    .nullable(),
  linkedUser: z.object({ id: IdSchema, email: z.string(), displayName: z.string() }).nullable(),
  engagements: z.array(EngagementSchema),
  portraitUrl: z.string().nullable(),
  thumbnailUrl: z.string().nullable(),
  consents: z.array(ConsentSummarySchema),
  bookings: z.array(BookingSchema),
  version: VersionSchema,
  canEdit: z.boolean(),
  canSeeMedical: z.boolean(),
});
export type PerformerDetail = z.infer<typeof PerformerDetailSchema>;

// ---- CSV import / export
export const CSV_COLUMNS = [
  'legal_name',
  'preferred_name',
  'pronouns',
  'email',
  'phone',
  'emergency_contact_name',
  'emergency_contact_phone',
  'agent_name',
  'agent_contact',
  'character_name',
  'notes',
] as const;
export type CsvColumn = (typeof CSV_COLUMNS)[number];

export const CsvImportQuerySchema = z.object({
  productionId: IdSchema,
  commit: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
});

export const CsvRowResultSchema = z.object({
  line: z.number().int(),
  legalName: z.string(),
  email: z.string().nullable(),
  action: z.enum(['create', 'engage_existing', 'already_engaged']),
  errors: z.record(z.string(), z.array(z.string())),
});
export const CsvImportResultSchema = z.object({
  committed: z.boolean(),
  rows: z.array(CsvRowResultSchema),
  errorCount: z.number().int(),
  /** File-level problems (missing columns, not a CSV, too many rows). */
  fileErrors: z.array(z.string()),
  created: z.number().int(),
  engaged: z.number().int(),
});
export type CsvImportResult = z.infer<typeof CsvImportResultSchema>;
