import { z } from 'zod';
import { BUILD_MATERIAL_ROLES, PIECE_STATUSES } from '../domain/builds.ts';
import { PLATINUM_APPLIANCE_DEMOLD_MINUTES } from '../domain/cure.ts';
import { CoatingInputSchema, MixInputSchema, SparesRuleSchema } from './appliance-calc.ts';
import { BodyRegionSchema, CastKindSchema, CastStatusSchema } from './archive.ts';
import { ProductCategorySchema } from './catalogue.ts';
import { CalendarDateSchema, IdSchema, VersionSchema, pagedSchema } from './common.ts';

/*
 * Appliance builds as the API reads and writes them: the mold a run was poured from, the materials and
 * lots that went into it, the weigh-out worked out and what was actually weighed, the cure time, and
 * each piece. Nothing here is medical: a build is about materials, never about a performer's skin.
 */

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));

export const BuildMaterialRoleSchema = z.enum(BUILD_MATERIAL_ROLES, { message: 'Choose what the material is for' });
export const PieceStatusSchema = z.enum(PIECE_STATUSES, { message: 'Choose on the shelf, used or spoiled' });
export const MixIngredientSchema = z.enum(['partA', 'softener', 'pigment', 'partB']);

// ---- input

export const BuildMaterialInputSchema = z.object({
  role: BuildMaterialRoleSchema,
  productId: z.uuid({ message: 'Choose the product' }),
  lotId: z.uuid({ message: 'Choose the lot' }),
});
export type BuildMaterialInput = z.infer<typeof BuildMaterialInputSchema>;

const weighedGrams = z
  .number({ error: 'Enter the weighed amount as a number' })
  .min(0, 'A weighed amount cannot be negative')
  .max(100_000, 'At most 100000 g')
  .nullable()
  .default(null);

/** What the scale actually showed for each part of the batch; null where it was not noted. */
export const WeighedSchema = z.object({ partA: weighedGrams, softener: weighedGrams, pigment: weighedGrams, partB: weighedGrams });
export type Weighed = z.infer<typeof WeighedSchema>;
const NOTHING_WEIGHED: Weighed = { partA: null, softener: null, pigment: null, partB: null };

const buildFields = {
  madeOn: CalendarDateSchema,
  madeBy: z.string({ error: 'Say who made the pieces' }).trim().min(1, 'Say who made the pieces').max(120, 'At most 120 characters'),
  materials: z.array(BuildMaterialInputSchema, { error: 'List the materials' }).max(40, 'At most 40 materials'),
  mix: MixInputSchema,
  weighed: WeighedSchema.default(NOTHING_WEIGHED),
  coating: CoatingInputSchema.nullable().default(null),
  cureMinutes: z
    .number({ error: 'Enter the cure time in minutes' })
    .int('Give the cure time in whole minutes')
    .positive('The cure time must be more than 0 minutes')
    .max(10_080, 'At most 10080 minutes (a week)')
    .default(PLATINUM_APPLIANCE_DEMOLD_MINUTES),
  piecesMade: z
    .number({ error: 'Enter the pieces made as a number' })
    .int('Pieces made must be a whole number')
    .min(0, 'Pieces made cannot be negative')
    .max(500, 'At most 500 pieces in one build'),
  notes: optionalText(4000),
};

export const CreateBuildInputSchema = z.object({
  productionId: IdSchema,
  moldId: z.uuid({ message: 'Choose the mold' }),
  ...buildFields,
});
export type CreateBuildInput = z.input<typeof CreateBuildInputSchema>;
export type CreateBuildValues = z.output<typeof CreateBuildInputSchema>;

/** An edit keeps the build's mold and production; everything else may be corrected. */
export const UpdateBuildInputSchema = z.object({ ...buildFields, version: VersionSchema });
export type UpdateBuildInput = z.input<typeof UpdateBuildInputSchema>;
export type UpdateBuildValues = z.output<typeof UpdateBuildInputSchema>;

export const MarkPieceInputSchema = z
  .object({
    status: PieceStatusSchema,
    /** The logged application the piece was worn for, once applications are logged. */
    applicationId: IdSchema.nullable().default(null),
    note: optionalText(500),
    version: VersionSchema,
  })
  .superRefine((v, ctx) => {
    if (v.applicationId !== null && v.status !== 'used') ctx.addIssue({ code: 'custom', path: ['applicationId'], message: 'Only a used piece is linked to an application' });
  });
export type MarkPieceInput = z.input<typeof MarkPieceInputSchema>;
export type MarkPieceValues = z.output<typeof MarkPieceInputSchema>;

const wholeDays = z
  .number({ error: 'Enter the shoot days as a number' })
  .int('Shoot days must be a whole number')
  .min(0, 'Shoot days cannot be negative')
  .max(1000, 'At most 1000 shoot days');

/** The shoot days still to come for one appliance (a mold on a production), with spares, set by the head. */
export const SetPlanInputSchema = z.object({
  productionId: IdSchema,
  moldId: IdSchema,
  shootDaysPlanned: wholeDays,
  spares: SparesRuleSchema,
  piecesPerDay: z
    .number({ error: 'Enter the pieces per day as a number' })
    .int('Pieces per day must be a whole number')
    .min(1, 'At least one piece a day')
    .max(100, 'At most 100 pieces a day')
    .default(1),
  /** The plan's version, or null when none is set yet. */
  version: VersionSchema.nullable(),
});
export type SetPlanInput = z.input<typeof SetPlanInputSchema>;
export type SetPlanValues = z.output<typeof SetPlanInputSchema>;

export const BuildListQuerySchema = z.object({
  productionId: IdSchema,
  performerId: IdSchema.optional(),
  moldId: IdSchema.optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type BuildListQuery = z.infer<typeof BuildListQuerySchema>;
export const ProductionQuerySchema = z.object({ productionId: IdSchema });
export const BuildPhotoQuerySchema = z.object({ size: z.enum(['photo', 'thumbnail']).default('photo'), v: z.string().max(100).optional() });

// ---- replies

export const MixPlanSchema = z.object({
  steps: z.array(z.object({ ingredient: MixIngredientSchema, grams: z.number(), drops: z.number().int().nullable() })),
  totalG: z.number(),
  partBDriftPercent: z.number(),
  belowResolution: z.array(MixIngredientSchema),
});
export type MixPlanOut = z.infer<typeof MixPlanSchema>;

export const CoatingVolumesSchema = z.object({ capMl: z.number(), solventMl: z.number(), totalMl: z.number() });

export const MoldRefSchema = z.object({
  id: IdSchema,
  labelCode: z.string(),
  region: BodyRegionSchema,
  kind: CastKindSchema,
  productionName: z.string(),
});
export type MoldRef = z.infer<typeof MoldRefSchema>;

const PersonRefSchema = z.object({ id: IdSchema, name: z.string() });

export const BuildMaterialSchema = z.object({
  position: z.number().int(),
  role: BuildMaterialRoleSchema,
  product: z.object({ id: IdSchema, name: z.string(), category: ProductCategorySchema }),
  lot: z.object({ id: IdSchema, code: z.string(), expiresOn: z.string() }),
  /** The formulation the lot was of when the build was recorded: what clearance keys on. */
  formulationId: IdSchema,
  safetySheetUrl: z.string().nullable(),
});
export type BuildMaterial = z.infer<typeof BuildMaterialSchema>;

export const PieceSchema = z.object({
  id: IdSchema,
  number: z.number().int(),
  status: PieceStatusSchema,
  applicationId: IdSchema.nullable(),
  statusAt: z.string().nullable(),
  statusBy: z.string().nullable(),
  note: z.string().nullable(),
  version: z.number().int(),
});
export type Piece = z.infer<typeof PieceSchema>;

export const TallySchema = z.object({ made: z.number().int(), used: z.number().int(), spoiled: z.number().int(), remaining: z.number().int() });
export type Tally = z.infer<typeof TallySchema>;

export const ShortfallSchema = z.object({ needed: z.number().int(), remaining: z.number().int(), shortBy: z.number().int(), short: z.boolean() });

export const AppliancePlanSchema = z.object({
  shootDaysPlanned: z.number().int(),
  spares: SparesRuleSchema,
  piecesPerDay: z.number().int(),
  updatedAt: z.string(),
  updatedBy: z.string().nullable(),
  version: z.number().int(),
});
export type AppliancePlan = z.infer<typeof AppliancePlanSchema>;

/** One appliance (a mold's pieces on a production): pieces left across its builds against the shoot days planned. */
export const ApplianceOutlookSchema = z.object({
  productionId: IdSchema,
  mold: MoldRefSchema,
  performer: PersonRefSchema,
  builds: z.number().int(),
  tally: TallySchema,
  plan: AppliancePlanSchema.nullable(),
  shortfall: ShortfallSchema.nullable(),
});
export type ApplianceOutlook = z.infer<typeof ApplianceOutlookSchema>;
export const ApplianceOutlookListSchema = z.object({ items: z.array(ApplianceOutlookSchema), canPlan: z.boolean() });

export const BuildPhotoSchema = z.object({ url: z.string(), thumbnailUrl: z.string() });

export const BuildListItemSchema = z.object({
  id: IdSchema,
  productionId: IdSchema,
  madeOn: z.string(),
  madeBy: z.string(),
  performer: PersonRefSchema,
  mold: MoldRefSchema,
  /** The appliance silicone (part A) and its lot. */
  silicone: z.object({ productName: z.string(), lotCode: z.string() }).nullable(),
  tally: TallySchema,
  thumbnailUrl: z.string().nullable(),
});
export type BuildListItem = z.infer<typeof BuildListItemSchema>;
export const BuildPageSchema = pagedSchema(BuildListItemSchema).extend({ canManage: z.boolean() });

export const BuildDetailSchema = BuildListItemSchema.extend({
  productionName: z.string(),
  materials: z.array(BuildMaterialSchema),
  mix: MixInputSchema,
  plan: MixPlanSchema,
  weighed: WeighedSchema,
  coating: CoatingInputSchema.nullable(),
  coatingVolumes: CoatingVolumesSchema.nullable(),
  cureMinutes: z.number().int(),
  notes: z.string().nullable(),
  pieces: z.array(PieceSchema),
  /** Every build of this mold on this production, against its shoot days. */
  outlook: ApplianceOutlookSchema,
  photo: BuildPhotoSchema.nullable(),
  canManage: z.boolean(),
  canPlan: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
  version: z.number().int(),
});
export type BuildDetail = z.infer<typeof BuildDetailSchema>;

/** A mold a production may run pieces from: of a performer engaged on it, still held by the archive. */
export const MoldOptionSchema = MoldRefSchema.extend({
  performerId: IdSchema,
  performerName: z.string(),
  madeOn: z.string(),
  status: CastStatusSchema,
});
export type MoldOption = z.infer<typeof MoldOptionSchema>;
export const MoldOptionListSchema = z.object({ items: z.array(MoldOptionSchema) });

/** A performer's builds with what went into them: for the performer's own record and for staff of their productions. */
export const PerformerBuildsSchema = z.object({
  items: z.array(BuildListItemSchema.extend({ productionName: z.string(), materials: z.array(BuildMaterialSchema) })),
});
export type PerformerBuilds = z.infer<typeof PerformerBuildsSchema>;
