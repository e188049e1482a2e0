import { z } from 'zod';
import { EXPOSURE_TYPES, LOT_STATES, PRODUCT_CATEGORIES } from '../domain/catalogue.ts';
import { parseInciList } from '../domain/ingredients.ts';
import { IdSchema, VersionSchema, pagedSchema } from './common.ts';
import { MixRatioSchema } from './appliance-calc.ts';
import { AllergenGroupSchema, IngredientSchema } from './patch-tests.ts';

/*
 * The product catalogue as the API reads and writes it: the ingredient vocabulary, products with
 * their formulations (each with its ingredient list in label order) and lots, and the safety data sheet.
 * Nothing here is medical: the catalogue is about products, never about a performer.
 */

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));

// ---- ingredients

export const IngredientInputSchema = IngredientSchema;
export type IngredientInput = z.infer<typeof IngredientInputSchema>;
export const UpdateIngredientInputSchema = z.object({ ingredient: IngredientSchema, version: VersionSchema });
export type UpdateIngredientInput = z.infer<typeof UpdateIngredientInputSchema>;

/** A vocabulary entry as a formulation shows it. */
export const IngredientRefSchema = z.object({
  id: IdSchema,
  inci: z.string(),
  group: AllergenGroupSchema,
  trivial: z.boolean(),
});
export type IngredientRefOut = z.infer<typeof IngredientRefSchema>;

export const IngredientRecordSchema = z.object({
  id: IdSchema,
  inci: z.string(),
  synonyms: z.array(z.string()),
  cas: z.string().nullable(),
  group: AllergenGroupSchema,
  trivial: z.boolean(),
  /** Products whose current formulation lists it. */
  productCount: z.number().int(),
  version: z.number().int(),
  updatedAt: z.string(),
});
export type IngredientRecord = z.infer<typeof IngredientRecordSchema>;

export const IngredientDetailSchema = IngredientRecordSchema.extend({
  products: z.array(z.object({ id: IdSchema, name: z.string() })),
});
export type IngredientDetail = z.infer<typeof IngredientDetailSchema>;

export const IngredientListQuerySchema = z.object({
  q: z.string().trim().max(200).optional(),
  group: AllergenGroupSchema.optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(50),
});
export type IngredientListQuery = z.infer<typeof IngredientListQuerySchema>;
export const IngredientPageSchema = pagedSchema(IngredientRecordSchema);

// ---- ingredient lists pasted from a label

export const INCI_LABEL_MAX_CHARS = 5000;
export const INCI_LABEL_MAX_NAMES = 200;

/**
 * An ingredient list as printed ("Ingredients: Aqua, Glycerin, …"). Empty means "not recorded yet";
 * text that holds no name at all is refused rather than taken for an empty list.
 */
export const InciLabelSchema = z
  .string()
  .trim()
  .max(INCI_LABEL_MAX_CHARS, `At most ${INCI_LABEL_MAX_CHARS.toLocaleString('en-GB')} characters`)
  .nullable()
  .optional()
  .transform((v) => (v ? v : null))
  .superRefine((label, ctx) => {
    if (label === null) return;
    const names = parseInciList(label);
    if (names.length === 0) ctx.addIssue({ code: 'custom', message: 'No ingredient names found. Paste the list from the label, or leave it empty if it is not known yet.' });
    else if (names.length > INCI_LABEL_MAX_NAMES) ctx.addIssue({ code: 'custom', message: `At most ${INCI_LABEL_MAX_NAMES} ingredients` });
    const long = names.find((n) => n.length > 200);
    if (long) ctx.addIssue({ code: 'custom', message: `“${long.slice(0, 40)}…” is longer than any ingredient name; check the commas in the list` });
  });

export const MatchLabelInputSchema = z.object({ label: z.string().trim().min(1, 'Paste the ingredient list').max(INCI_LABEL_MAX_CHARS) });

/** One name of a pasted list, matched to the vocabulary (or not). */
export const LabelMatchSchema = z.object({
  name: z.string(),
  mayContain: z.boolean(),
  ingredient: IngredientRefSchema.nullable(),
  /** The same ingredient was listed earlier; it is kept once. */
  duplicate: z.boolean(),
});
export type LabelMatch = z.infer<typeof LabelMatchSchema>;
export const LabelMatchesSchema = z.object({ entries: z.array(LabelMatchSchema) });

// ---- products

export const ProductCategorySchema = z.enum(PRODUCT_CATEGORIES, { message: 'Choose a category' });
export const ExposureTypeSchema = z.enum(EXPOSURE_TYPES, { message: 'Choose leave-on or rinse-off' });

const optionalNumber = (schema: z.ZodNumber) => schema.nullable().optional().transform((v) => v ?? null);

/** What a head edits about a product. The material figures matter for silicones and are optional everywhere. */
export const ProductFieldsSchema = z.object({
  name: z.string().trim().min(1, 'Enter the product name').max(160, 'At most 160 characters'),
  maker: optionalText(160),
  category: ProductCategorySchema,
  exposure: ExposureTypeSchema,
  densityGPerCm3: optionalNumber(z.number({ error: 'Enter the density as a number' }).positive('The density must be more than 0').max(25, 'At most 25 g/cm³')),
  mixRatio: MixRatioSchema.nullable()
    .optional()
    .transform((v) => v ?? null),
  makerMaxSoftenerPercent: optionalNumber(z.number({ error: 'Enter the percentage as a number' }).min(0, 'Cannot be negative').max(1000, 'At most 1000 %')),
});
export type ProductFields = z.output<typeof ProductFieldsSchema>;

export const CreateProductInputSchema = ProductFieldsSchema.extend({
  inciLabel: InciLabelSchema,
  formulationNote: optionalText(500),
});
export type CreateProductInput = z.input<typeof CreateProductInputSchema>;
export const UpdateProductInputSchema = ProductFieldsSchema.extend({ version: VersionSchema });
export type UpdateProductInput = z.input<typeof UpdateProductInputSchema>;

/** A new formulation: the product's version it was based on, and the new label. */
export const NewFormulationInputSchema = z.object({ inciLabel: InciLabelSchema, note: optionalText(500), version: VersionSchema });
export type NewFormulationInput = z.input<typeof NewFormulationInputSchema>;

/** Recording the ingredients of a formulation that had none recorded; a recorded list is never rewritten. */
export const RecordIngredientsInputSchema = z.object({
  inciLabel: InciLabelSchema.refine((v) => v !== null, 'Paste the ingredient list'),
  version: VersionSchema,
});

export const FormulationIngredientSchema = z.object({
  position: z.number().int(),
  name: z.string(),
  mayContain: z.boolean(),
  ingredient: IngredientRefSchema.nullable(),
});
export type FormulationIngredient = z.infer<typeof FormulationIngredientSchema>;

export const FormulationSchema = z.object({
  id: IdSchema,
  version: z.number().int(),
  current: z.boolean(),
  note: z.string().nullable(),
  /** The list as pasted; null when the ingredients were never recorded. */
  inciLabel: z.string().nullable(),
  /** In label order; null when not recorded. */
  ingredients: z.array(FormulationIngredientSchema).nullable(),
  createdAt: z.string(),
  createdBy: z.string().nullable(),
});
export type Formulation = z.infer<typeof FormulationSchema>;

// ---- lots

/** A lot's last day of use; years outside 2000–2100 are typing slips, not dates on a tub. */
export const LotExpirySchema = z.iso.date({ message: 'Use a date like 2027-03-31' }).refine((d) => {
  const year = Number(d.slice(0, 4));
  return year >= 2000 && year <= 2100;
}, 'Use an expiry date between the years 2000 and 2100');

export const LotFieldsSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1, 'Enter the lot code')
    .max(60, 'At most 60 characters'),
  expiresOn: LotExpirySchema,
  /** Left out: the product's current formulation. */
  formulationId: IdSchema.optional(),
});
export const CreateLotInputSchema = LotFieldsSchema;
export type CreateLotInput = z.input<typeof CreateLotInputSchema>;
export const UpdateLotInputSchema = LotFieldsSchema.extend({ version: VersionSchema });
export type UpdateLotInput = z.input<typeof UpdateLotInputSchema>;
export const RetireLotInputSchema = z.object({ retired: z.boolean(), version: VersionSchema });

export const LotStateSchema = z.enum(LOT_STATES);
export const LotSchema = z.object({
  id: IdSchema,
  code: z.string(),
  expiresOn: z.string(),
  formulationId: IdSchema,
  formulationVersion: z.number().int(),
  state: LotStateSchema,
  retiredAt: z.string().nullable(),
  version: z.number().int(),
});
export type Lot = z.infer<typeof LotSchema>;

// ---- safety data sheet

export const SDS_MAX_BYTES = 10 * 1024 * 1024;
export const SafetySheetSchema = z.object({
  fileName: z.string(),
  byteSize: z.number().int(),
  uploadedAt: z.string(),
  uploadedBy: z.string().nullable(),
  url: z.string(),
});

// ---- product replies

export const ProductDetailSchema = z.object({
  id: IdSchema,
  name: z.string(),
  maker: z.string().nullable(),
  category: ProductCategorySchema,
  exposure: ExposureTypeSchema,
  densityGPerCm3: z.number().nullable(),
  mixRatio: z.object({ partA: z.number(), partB: z.number() }).nullable(),
  makerMaxSoftenerPercent: z.number().nullable(),
  currentFormulationId: IdSchema.nullable(),
  /** Newest first. */
  formulations: z.array(FormulationSchema),
  /** Soonest expiry first; retired lots last. */
  lots: z.array(LotSchema),
  safetySheet: SafetySheetSchema.nullable(),
  /** Show the solvent caution beside the product and its safety data sheet. */
  solventCaution: z.boolean(),
  version: z.number().int(),
  updatedAt: z.string(),
});
export type ProductDetail = z.infer<typeof ProductDetailSchema>;

export const ProductListItemSchema = z.object({
  id: IdSchema,
  name: z.string(),
  maker: z.string().nullable(),
  category: ProductCategorySchema,
  exposure: ExposureTypeSchema,
  formulationVersion: z.number().int().nullable(),
  /** Null when the current formulation's ingredients are not recorded. */
  ingredientCount: z.number().int().nullable(),
  groups: z.array(AllergenGroupSchema),
  usableLots: z.number().int(),
  expiredLots: z.number().int(),
  /** The soonest last day among lots still usable. */
  nextExpiry: z.string().nullable(),
  hasSafetySheet: z.boolean(),
  solventCaution: z.boolean(),
});
export type ProductListItem = z.infer<typeof ProductListItemSchema>;

export const PRODUCT_SORTS = ['name', 'maker', 'category'] as const;
export const ProductListQuerySchema = z.object({
  q: z.string().trim().max(200).optional(),
  category: ProductCategorySchema.optional(),
  group: AllergenGroupSchema.optional(),
  expiredLots: z.enum(['true', 'false']).optional(),
  sort: z.enum(PRODUCT_SORTS).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type ProductListQuery = z.infer<typeof ProductListQuerySchema>;
export const ProductPageSchema = pagedSchema(ProductListItemSchema);

export const LotParamsSchema = z.object({ id: IdSchema, lotId: IdSchema });
export const FormulationParamsSchema = z.object({ id: IdSchema, formulationId: IdSchema });

/** The text field sent with a safety-data-sheet upload: the product version it was based on. */
export const SafetySheetFieldsSchema = z.object({ version: z.coerce.number({ error: 'Send the product version' }).int().min(1) });
