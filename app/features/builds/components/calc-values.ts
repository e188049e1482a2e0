import { z } from 'zod';
import { fieldErrorsFromIssues, type FieldErrors } from '#shared/errors.ts';
import { DEFAULT_DROP_MASS_G, DEFAULT_SCALE_RESOLUTION_G, type MixRatio } from '#shared/domain/mix.ts';
import { MOLD_BOX_DEFAULTS, type SculptShape } from '#shared/domain/mold-box.ts';
import { CoatingInputSchema, MixInputSchema, MoldBoxInputSchema, type CoatingInput, type MixInput } from '#shared/schemas/appliance-calc.ts';

/*
 * The calculators' forms as typed: every number stays text until the shared schema reads it, so the
 * screens give exactly the messages the API gives.
 */

/** A typed number: blank is "not given" (the schema then asks for it), a decimal comma is read as a point. */
export function typedNumber(v: string | undefined): number | undefined {
  if (v === undefined || v.trim() === '') return undefined;
  return Number(v.trim().replace(',', '.'));
}

const text = (n: number | null | undefined) => (n === null || n === undefined ? '' : String(n));

// ---- the mix

export interface MixFormValues {
  ratio: { partA: string; partB: string };
  softener: { percent: string; makerMaxPercent: string };
  pigment: { kind: 'none' | 'percent' | 'drops'; percent: string; drops: string; dropMassG: string };
  target: { kind: 'total' | 'partA'; totalG: string; partAG: string };
  scaleResolutionG: string;
}

/** The typed mix in the shape MixInputSchema reads; no softener typed is no softener. */
export function toMixInput(v: MixFormValues): unknown {
  const pigment =
    v.pigment.kind === 'none'
      ? null
      : v.pigment.kind === 'percent'
        ? { kind: 'percent', percent: typedNumber(v.pigment.percent) }
        : { kind: 'drops', drops: typedNumber(v.pigment.drops), dropMassG: typedNumber(v.pigment.dropMassG) };
  return {
    ratio: { partA: typedNumber(v.ratio.partA), partB: typedNumber(v.ratio.partB) },
    softener: v.softener.percent.trim() === '' ? null : { percent: typedNumber(v.softener.percent), makerMaxPercent: typedNumber(v.softener.makerMaxPercent) },
    pigment,
    target: v.target.kind === 'total' ? { kind: 'total', totalG: typedNumber(v.target.totalG) } : { kind: 'partA', partAG: typedNumber(v.target.partAG) },
    scaleResolutionG: typedNumber(v.scaleResolutionG),
  };
}

export const MixFormSchema = z.custom<MixFormValues>().transform(toMixInput).pipe(MixInputSchema);

export function mixFormValues(mix?: MixInput | null): MixFormValues {
  return {
    ratio: { partA: text(mix?.ratio.partA ?? 1), partB: text(mix?.ratio.partB ?? 1) },
    softener: { percent: text(mix?.softener?.percent), makerMaxPercent: text(mix?.softener?.makerMaxPercent) },
    pigment: {
      kind: mix?.pigment?.kind ?? 'none',
      percent: mix?.pigment?.kind === 'percent' ? text(mix.pigment.percent) : '',
      drops: mix?.pigment?.kind === 'drops' ? text(mix.pigment.drops) : '',
      dropMassG: text(mix?.pigment?.kind === 'drops' ? mix.pigment.dropMassG : DEFAULT_DROP_MASS_G),
    },
    target: {
      kind: mix?.target.kind ?? 'total',
      totalG: mix?.target.kind === 'total' ? text(mix.target.totalG) : mix ? '' : '100',
      partAG: mix?.target.kind === 'partA' ? text(mix.target.partAG) : '',
    },
    scaleResolutionG: text(mix?.scaleResolutionG ?? DEFAULT_SCALE_RESOLUTION_G),
  };
}

// ---- the coating

export interface CoatingFormValues {
  capParts: string;
  solventParts: string;
  targetMl: string;
}

export function toCoatingInput(v: CoatingFormValues): unknown {
  return { capParts: typedNumber(v.capParts), solventParts: typedNumber(v.solventParts), targetMl: typedNumber(v.targetMl) };
}

export const CoatingFormSchema = z.custom<CoatingFormValues>().transform(toCoatingInput).pipe(CoatingInputSchema);

export function coatingFormValues(c?: CoatingInput | null): CoatingFormValues {
  return { capParts: text(c?.capParts ?? 1), solventParts: text(c?.solventParts ?? 8), targetMl: text(c?.targetMl ?? 90) };
}

/** A blank coating form is no coating at all. */
export function coatingGiven(v: CoatingFormValues): boolean {
  return [v.capParts, v.solventParts, v.targetMl].some((s) => s.trim() !== '');
}

// ---- the mold box

export interface MoldBoxFormValues {
  footprintLengthMm: string;
  footprintWidthMm: string;
  highestPointMm: string;
  sculpt: { kind: 'measured' | 'shape'; volumeCm3: string; shape: SculptShape };
  wallClearanceMm: string;
  coverMm: string;
  densityGPerCm3: string;
  ratio: { partA: string; partB: string };
}

export function toMoldBoxInput(v: MoldBoxFormValues): unknown {
  return {
    footprintLengthMm: typedNumber(v.footprintLengthMm),
    footprintWidthMm: typedNumber(v.footprintWidthMm),
    highestPointMm: typedNumber(v.highestPointMm),
    sculpt: v.sculpt.kind === 'measured' ? { kind: 'measured', volumeCm3: typedNumber(v.sculpt.volumeCm3) } : { kind: 'shape', shape: v.sculpt.shape },
    wallClearanceMm: typedNumber(v.wallClearanceMm),
    coverMm: typedNumber(v.coverMm),
    densityGPerCm3: typedNumber(v.densityGPerCm3),
    ratio: { partA: typedNumber(v.ratio.partA), partB: typedNumber(v.ratio.partB) },
  };
}

export const MoldBoxFormSchema = z.custom<MoldBoxFormValues>().transform(toMoldBoxInput).pipe(MoldBoxInputSchema);

export function moldBoxFormValues(): MoldBoxFormValues {
  return {
    footprintLengthMm: '',
    footprintWidthMm: '',
    highestPointMm: '',
    sculpt: { kind: 'shape', volumeCm3: '', shape: 'half-ellipsoid' },
    wallClearanceMm: String(MOLD_BOX_DEFAULTS.wallClearanceMm),
    coverMm: String(MOLD_BOX_DEFAULTS.coverMm),
    densityGPerCm3: '',
    ratio: { partA: '1', partB: '1' },
  };
}

// ---- reading a form live

/** A form's values read through its schema now: the parsed input, or each field's messages by dotted path. */
export function readLive<T>(schema: z.ZodType<T>, values: unknown): { data: T; errors: FieldErrors } | { data: null; errors: FieldErrors } {
  const parsed = schema.safeParse(values);
  return parsed.success ? { data: parsed.data, errors: {} } : { data: null, errors: fieldErrorsFromIssues(parsed.error.issues) };
}

/** The figures a catalogue product gives a calculator; a missing figure is typed in. */
export interface MaterialFigures {
  ratio: MixRatio | null;
  makerMaxSoftenerPercent: number | null;
  densityGPerCm3: number | null;
}
