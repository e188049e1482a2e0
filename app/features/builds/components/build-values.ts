import { z } from 'zod';
import type { BuildMaterialRole } from '#shared/domain/builds.ts';
import { PLATINUM_APPLIANCE_DEMOLD_MINUTES } from '#shared/domain/cure.ts';
import { CreateBuildInputSchema, UpdateBuildInputSchema, type BuildDetail } from '#shared/schemas/builds.ts';
import { coatingFormValues, mixFormValues, toCoatingInput, toMixInput, typedNumber, type CoatingFormValues, type MixFormValues } from './calc-values.ts';

/** The build form as typed; numbers stay text until the shared schema reads them. */
export interface BuildFormValues {
  moldId: string;
  madeOn: string;
  madeBy: string;
  materials: { role: BuildMaterialRole; productId: string; lotId: string }[];
  mix: MixFormValues;
  weighed: { partA: string; softener: string; pigment: string; partB: string };
  withCoating: boolean;
  coating: CoatingFormValues;
  cureMinutes: string;
  piecesMade: string;
  notes: string;
}

/** A schema that reads the typed form into what the API takes. */
export type BuildFormSchema<Out> = z.ZodType<Out, BuildFormValues>;

const grams = (s: string) => typedNumber(s) ?? null;

function toBuildFields(v: BuildFormValues) {
  return {
    madeOn: v.madeOn,
    madeBy: v.madeBy,
    materials: v.materials,
    mix: toMixInput(v.mix),
    weighed: { partA: grams(v.weighed.partA), softener: grams(v.weighed.softener), pigment: grams(v.weighed.pigment), partB: grams(v.weighed.partB) },
    coating: v.withCoating ? toCoatingInput(v.coating) : null,
    cureMinutes: typedNumber(v.cureMinutes),
    piecesMade: typedNumber(v.piecesMade),
    notes: v.notes.trim() || null,
  };
}

/** The form read by the API's own schema for a new build on this production. */
export function createBuildFormSchema(productionId: string) {
  return z
    .custom<BuildFormValues>()
    .transform((v): unknown => ({ productionId, moldId: v.moldId, ...toBuildFields(v) }))
    .pipe(CreateBuildInputSchema);
}

/** The form read by the API's own schema for a correction of a build at this version. */
export function updateBuildFormSchema(version: number) {
  return z
    .custom<BuildFormValues>()
    .transform((v): unknown => ({ ...toBuildFields(v), version }))
    .pipe(UpdateBuildInputSchema);
}

const text = (n: number | null | undefined) => (n === null || n === undefined ? '' : String(n));

function today(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

export function buildFormValues(b?: BuildDetail, defaults: { moldId?: string; madeBy?: string } = {}): BuildFormValues {
  return {
    moldId: b?.mold.id ?? defaults.moldId ?? '',
    madeOn: b?.madeOn ?? today(),
    madeBy: b?.madeBy ?? defaults.madeBy ?? '',
    materials: b
      ? b.materials.map((m) => ({ role: m.role, productId: m.product.id, lotId: m.lot.id }))
      : [
          { role: 'part_a', productId: '', lotId: '' },
          { role: 'part_b', productId: '', lotId: '' },
        ],
    mix: mixFormValues(b?.mix),
    weighed: { partA: text(b?.weighed.partA), softener: text(b?.weighed.softener), pigment: text(b?.weighed.pigment), partB: text(b?.weighed.partB) },
    withCoating: Boolean(b?.coating),
    coating: coatingFormValues(b?.coating),
    cureMinutes: String(b?.cureMinutes ?? PLATINUM_APPLIANCE_DEMOLD_MINUTES),
    piecesMade: b ? String(b.tally.made) : '',
    notes: b?.notes ?? '',
  };
}
