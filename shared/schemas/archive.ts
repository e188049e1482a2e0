import { z } from 'zod';
import { BODY_REGIONS, CAST_KINDS, CAST_STATUSES, CONDITION_GRADES } from '../domain/archive-casts.ts';
import { LOCATION_LEVELS } from '../domain/archive-locations.ts';
import { MOVEMENT_KINDS } from '../domain/archive-movements.ts';
import { CalendarDateSchema, IdSchema, MomentInputSchema, VersionSchema, pagedSchema } from './common.ts';

/** Free text a person types: trimmed, "" read as not given. */
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));
/** Text the archive's rules check for blanks themselves, so the person reads the rule's own words. */
const ruleText = (max: number) => z.string().trim().max(max, `At most ${max} characters`).optional().default('');

export const LocationLevelSchema = z.enum(LOCATION_LEVELS, { message: 'Choose site, room, rack, shelf or bin' });
export const BodyRegionSchema = z.enum(BODY_REGIONS, { message: 'Choose the body region' });
export const CastKindSchema = z.enum(CAST_KINDS, { message: 'Choose mold, positive, core or other' });
export const CastStatusSchema = z.enum(CAST_STATUSES);
export const ConditionGradeSchema = z.enum(CONDITION_GRADES, { message: 'Choose good, fair, poor or damaged.' });
export const MovementKindSchema = z.enum(MOVEMENT_KINDS);

// ---- storage places

export const LocationSchema = z.object({
  id: IdSchema,
  parentId: IdSchema.nullable(),
  level: LocationLevelSchema,
  code: z.string(),
  name: z.string(),
  environment: z.string().nullable(),
  labelCode: z.string(),
  /** Codes from the site down, e.g. "GH/NORTH/R1/2". */
  path: z.string(),
  /** Names from the site down. */
  breadcrumb: z.string(),
  /** Casts whose current place is this one, and this one with everything below it. */
  castsHere: z.number().int(),
  castsBelow: z.number().int(),
  version: VersionSchema,
});
export type Location = z.infer<typeof LocationSchema>;
export const LocationTreeSchema = z.object({ items: z.array(LocationSchema), canManage: z.boolean() });
export type LocationTree = z.infer<typeof LocationTreeSchema>;

const locationFields = {
  parentId: IdSchema.nullable(),
  code: z.string().trim().max(20, 'Keep the short code to 10 characters or fewer.'),
  name: z.string().trim().min(1, 'Give the place a name').max(120, 'At most 120 characters'),
  environment: optionalText(1000),
};
export const CreateLocationInputSchema = z.object({ ...locationFields, level: LocationLevelSchema });
export type CreateLocationInput = z.infer<typeof CreateLocationInputSchema>;
export const UpdateLocationInputSchema = z.object({ ...locationFields, version: VersionSchema });
export type UpdateLocationInput = z.infer<typeof UpdateLocationInputSchema>;
export const DeleteLocationQuerySchema = z.object({ version: z.coerce.number().int().min(1) });

// ---- casts in lists

export const CastListItemSchema = z.object({
  id: IdSchema,
  labelCode: z.string(),
  performerId: IdSchema,
  performerName: z.string(),
  productionId: IdSchema,
  productionName: z.string(),
  region: BodyRegionSchema,
  kind: CastKindSchema,
  material: z.string(),
  madeOn: z.string(),
  status: CastStatusSchema,
  /** Where it is now, in words: a breadcrumb, a person, a production, or gone. */
  where: z.string(),
  currentLocationId: IdSchema.nullable(),
  /** Code path of the current place, when it is on a shelf or in a bin. */
  currentPath: z.string().nullable(),
  dueBackAt: z.iso.datetime().nullable(),
  overdue: z.boolean(),
  condition: ConditionGradeSchema.nullable(),
  thumbnailUrl: z.string().nullable(),
});
export type CastListItem = z.infer<typeof CastListItemSchema>;
export const CastPageSchema = pagedSchema(CastListItemSchema).extend({
  /** What the search box was read as: words, a place's code path, or a label code. */
  matched: z.enum(['all', 'text', 'code_path', 'label']),
  /** The place a code path or a place's label named, when it did. */
  place: z.object({ id: IdSchema, path: z.string(), breadcrumb: z.string() }).nullable(),
});
export type CastPage = z.infer<typeof CastPageSchema>;

export const CAST_SORTS = ['relevance', 'labelCode', 'madeOn', 'performer'] as const;
export const CastListQuerySchema = z.object({
  q: z.string().trim().max(200).optional(),
  region: BodyRegionSchema.optional(),
  kind: CastKindSchema.optional(),
  status: CastStatusSchema.optional(),
  productionId: IdSchema.optional(),
  overdue: z.enum(['true', 'false']).optional(),
  sort: z.enum(CAST_SORTS).default('relevance'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type CastListQuery = z.infer<typeof CastListQuerySchema>;

// ---- one cast

export const PhotoSchema = z.object({
  id: IdSchema,
  url: z.string(),
  thumbnailUrl: z.string(),
  width: z.number().int(),
  height: z.number().int(),
  conditionCheckId: IdSchema.nullable(),
  createdAt: z.iso.datetime(),
});
export type Photo = z.infer<typeof PhotoSchema>;

export const MovementSchema = z.object({
  id: IdSchema,
  kind: MovementKindSchema,
  at: z.iso.datetime(),
  movedBy: z.string(),
  authorisedBy: z.string(),
  from: z.string(),
  to: z.string(),
  reason: z.string().nullable(),
  dueBackAt: z.iso.datetime().nullable(),
  witness: z.string().nullable(),
  method: z.string().nullable(),
  contact: z.string().nullable(),
  note: z.string().nullable(),
});
export type MovementEntry = z.infer<typeof MovementSchema>;

export const ConditionCheckSchema = z.object({
  id: IdSchema,
  checkedOn: z.string(),
  checkedBy: z.string(),
  grade: ConditionGradeSchema,
  notes: z.string().nullable(),
  photos: z.array(PhotoSchema),
});
export type ConditionCheckEntry = z.infer<typeof ConditionCheckSchema>;

export const RetentionSchema = z.object({
  state: z.enum(['kept', 'review_soon', 'due', 'ended']),
  reason: z.string(),
  reviewOn: z.iso.datetime().nullable(),
});
export type Retention = z.infer<typeof RetentionSchema>;

const PlaceRefSchema = z.object({ id: IdSchema, path: z.string(), breadcrumb: z.string() });
const RelatedCastSchema = z.object({ id: IdSchema, labelCode: z.string(), kind: CastKindSchema, region: BodyRegionSchema, status: CastStatusSchema });

export const CastDetailSchema = CastListItemSchema.extend({
  madeBy: z.string(),
  notes: z.string().nullable(),
  pouredFrom: RelatedCastSchema.nullable(),
  pouredInto: z.array(RelatedCastSchema),
  normalLocation: PlaceRefSchema.nullable(),
  currentLocation: PlaceRefSchema.nullable(),
  holder: z.object({ name: z.string(), userId: IdSchema.nullable() }).nullable(),
  loanedTo: z.string().nullable(),
  since: z.iso.datetime(),
  retention: RetentionSchema,
  movements: z.array(MovementSchema),
  conditionChecks: z.array(ConditionCheckSchema),
  photos: z.array(PhotoSchema),
  /** Moves the cast's status allows now (the archive's rules), for showing commands. */
  allowedMovements: z.array(MovementKindSchema),
  canManage: z.boolean(),
  /** The address its label's QR holds. */
  labelUrl: z.string(),
  version: VersionSchema,
});
export type CastDetail = z.infer<typeof CastDetailSchema>;

const castFields = {
  region: BodyRegionSchema,
  kind: CastKindSchema,
  material: z.string().trim().min(1, 'Name the material, for example Gypsum stone').max(120, 'At most 120 characters'),
  madeOn: CalendarDateSchema,
  madeBy: z.string().trim().min(1, 'Say who made the cast').max(160, 'At most 160 characters'),
  pouredFromId: IdSchema.nullable().optional().transform((v) => v ?? null),
  notes: optionalText(4000),
};
export const CreateCastInputSchema = z.object({
  performerId: IdSchema,
  productionId: IdSchema,
  ...castFields,
  /** Its shelf or bin: the current place, and its normal home. */
  locationId: IdSchema,
});
export type CreateCastInput = z.infer<typeof CreateCastInputSchema>;
export const UpdateCastInputSchema = z.object({ ...castFields, version: VersionSchema });
export type UpdateCastInput = z.infer<typeof UpdateCastInputSchema>;

const moveBase = {
  /** The version of the cast the move was based on. */
  version: VersionSchema,
  /** When the move happened; now when left out. */
  at: MomentInputSchema.optional(),
  movedBy: ruleText(160),
  authorisedBy: ruleText(160),
  note: optionalText(1000),
};
export const MovementInputSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ ...moveBase, kind: z.literal('check_out'), holderUserId: IdSchema.nullable().optional(), holder: ruleText(160), reason: ruleText(500), dueBackAt: MomentInputSchema.nullable().optional() }),
    z.object({ ...moveBase, kind: z.literal('check_in'), to: IdSchema.nullable().optional() }),
    z.object({ ...moveBase, kind: z.literal('relocation'), to: IdSchema.nullable().optional(), alsoNormal: z.boolean().optional().default(false), reason: optionalText(500) }),
    z.object({ ...moveBase, kind: z.literal('loan'), production: ruleText(160), contact: optionalText(200), reason: optionalText(500), dueBackAt: MomentInputSchema.nullable().optional() }),
    z.object({ ...moveBase, kind: z.literal('return_to_performer'), reason: optionalText(500) }),
    z.object({ ...moveBase, kind: z.literal('destruction'), witness: ruleText(160), reason: ruleText(500), method: optionalText(200) }),
  ],
  { error: 'Choose check-out, check-in, relocation, loan, return to performer or destruction.' },
);
export type MovementInput = z.infer<typeof MovementInputSchema>;

export const ConditionCheckInputSchema = z.object({
  checkedOn: CalendarDateSchema,
  checkedBy: ruleText(160),
  grade: ConditionGradeSchema,
  notes: optionalText(4000),
});
export type ConditionCheckInput = z.infer<typeof ConditionCheckInputSchema>;

export const PhotoUploadQuerySchema = z.object({ conditionCheckId: IdSchema.optional() });
export const CastPhotoParamsSchema = z.object({ id: IdSchema, photoId: IdSchema });
export const PhotoFileQuerySchema = z.object({ v: z.string().max(100).optional() });

/** Staff of the cast's productions, to name as holder, authoriser or witness. */
export const PeopleSchema = z.object({ items: z.array(z.object({ userId: IdSchema, name: z.string() })) });
export type People = z.infer<typeof PeopleSchema>;

// ---- labels

export const LabelParamsSchema = z.object({ code: z.string().trim().min(1).max(40) });
export const LabelTargetSchema = z.object({ target: z.enum(['cast', 'location']), id: IdSchema, code: z.string() });
export type LabelTargetResult = z.infer<typeof LabelTargetSchema>;

const idList = z
  .string()
  .trim()
  .max(8000)
  .optional()
  .transform((v, ctx) => {
    const ids = (v ?? '').split(',').map((s) => s.trim()).filter(Boolean);
    for (const id of ids) {
      if (!IdSchema.safeParse(id).success) {
        ctx.addIssue({ code: 'custom', message: 'List ids separated by commas.' });
        return z.NEVER;
      }
    }
    return [...new Set(ids)];
  });
/** At most this many labels on one sheet; more is several print runs. */
export const LABEL_SHEET_MAX = 200;
export const LabelSheetQuerySchema = z.object({ casts: idList, locations: idList });

// ---- retention and the performer's own view

export const RetentionItemSchema = z.object({ cast: CastListItemSchema, retention: RetentionSchema });
export const RetentionListSchema = z.object({ due: z.array(RetentionItemSchema), soon: z.array(RetentionItemSchema) });
export type RetentionList = z.infer<typeof RetentionListSchema>;

/** A performer's own cast: what it is and where it is kept, without the staff's records of who moved it. */
export const OwnCastSchema = z.object({
  id: IdSchema,
  labelCode: z.string(),
  region: BodyRegionSchema,
  kind: CastKindSchema,
  material: z.string(),
  madeOn: z.string(),
  productionName: z.string(),
  status: CastStatusSchema,
  where: z.string(),
  retention: RetentionSchema,
  thumbnailUrl: z.string().nullable(),
});
export type OwnCast = z.infer<typeof OwnCastSchema>;
export const PerformerCastsSchema = z.discriminatedUnion('view', [
  z.object({ view: z.literal('staff'), items: z.array(CastListItemSchema), canAdd: z.boolean() }),
  z.object({ view: z.literal('own'), items: z.array(OwnCastSchema) }),
]);
export type PerformerCasts = z.infer<typeof PerformerCastsSchema>;

export const LocationDetailSchema = LocationSchema.extend({
  ancestors: z.array(LocationSchema),
  children: z.array(LocationSchema),
  /** Casts here or anywhere below, that the reader may see. */
  casts: z.array(CastListItemSchema),
  /** Casts that call this place home but are elsewhere now. */
  away: z.array(CastListItemSchema),
  canManage: z.boolean(),
});
export type LocationDetail = z.infer<typeof LocationDetailSchema>;
