import { z } from 'zod';
import { PLATINUM_APPLIANCE_DEMOLD_MINUTES } from '../domain/cure.ts';
import { DEFAULT_DROP_MASS_G, DEFAULT_SCALE_RESOLUTION_G, mixForRun, MIX_INGREDIENT_LABELS } from '../domain/mix.ts';
import { MOLD_BOX_DEFAULTS, SCULPT_SHAPES, maxSculptVolumeCm3 } from '../domain/mold-box.ts';
import { DEFAULT_PIECES_PER_DAY } from '../domain/pieces.ts';

/*
 * Inputs of the appliance build calculators. Lengths in mm, volumes in cm³ (= ml), masses in g,
 * percentages as numbers (15 means 15 %). Each refusal names its field, so a form can show it in place.
 */

const number = (what: string) => z.number({ error: `Enter ${what} as a number` });
const moreThanZero = (what: string, max: number, unit: string) =>
  number(what)
    .positive(`${capitalise(what)} must be more than 0`)
    .max(max, `At most ${max} ${unit}`);
const zeroOrMore = (what: string, max: number, unit: string) =>
  number(what)
    .min(0, `${capitalise(what)} cannot be negative`)
    .max(max, `At most ${max} ${unit}`);
const wholeCount = (what: string, max = 10_000) =>
  number(what)
    .int(`${capitalise(what)} must be a whole number`)
    .min(0, `${capitalise(what)} cannot be negative`)
    .max(max, `At most ${max}`);

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Parts of A to parts of B by weight; a zero or negative part is no ratio at all. */
export const MixRatioSchema = z.object(
  {
    partA: moreThanZero('part A of the ratio', 1000, 'parts'),
    partB: moreThanZero('part B of the ratio', 1000, 'parts'),
  },
  { error: 'Enter the mix ratio' },
);

export const SculptVolumeSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('measured'), volumeCm3: moreThanZero('the sculpt volume', 1_000_000, 'cm³') }),
  z.object({ kind: z.literal('shape'), shape: z.enum(SCULPT_SHAPES, { error: 'Choose a shape' }) }),
], { error: 'Enter the sculpt volume or choose a shape' });

export const MoldBoxInputSchema = z
  .object({
    footprintLengthMm: moreThanZero('the footprint length', 5000, 'mm'),
    footprintWidthMm: moreThanZero('the footprint width', 5000, 'mm'),
    highestPointMm: moreThanZero('the highest point', 5000, 'mm'),
    sculpt: SculptVolumeSchema,
    wallClearanceMm: moreThanZero('the wall clearance', 500, 'mm').default(MOLD_BOX_DEFAULTS.wallClearanceMm),
    coverMm: moreThanZero('the cover over the highest point', 500, 'mm').default(MOLD_BOX_DEFAULTS.coverMm),
    densityGPerCm3: moreThanZero('the density', 25, 'g/cm³'),
    ratio: MixRatioSchema,
  })
  .superRefine((v, ctx) => {
    if (v.sculpt.kind !== 'measured' || !allPositive(v.footprintLengthMm, v.footprintWidthMm, v.highestPointMm)) return;
    // The sculpt sits inside its own footprint and under its highest point, so that block bounds it; the mold box is larger still.
    const most = maxSculptVolumeCm3(v.footprintLengthMm, v.footprintWidthMm, v.highestPointMm);
    if (v.sculpt.volumeCm3 > most) {
      ctx.addIssue({
        code: 'custom',
        path: ['sculpt', 'volumeCm3'],
        message: `More than fits on the footprint under the highest point (at most ${round1(most)} cm³), so more than the mold box holds`,
      });
    }
  });
export type MoldBoxInput = z.infer<typeof MoldBoxInputSchema>;

export const SoftenerDoseSchema = z
  .object({
    percent: zeroOrMore('the softener', 1000, '%'),
    makerMaxPercent: zeroOrMore("the maker's maximum softener", 1000, '%'),
  })
  .superRefine((v, ctx) => {
    if (v.percent > v.makerMaxPercent) {
      ctx.addIssue({ code: 'custom', path: ['percent'], message: `At most ${v.makerMaxPercent} %, the maker's stated maximum` });
    }
  });

export const PigmentDoseSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('percent'), percent: zeroOrMore('the pigment', 100, '%') }),
  z.object({
    kind: z.literal('drops'),
    drops: wholeCount('the drops of pigment', 1000),
    dropMassG: moreThanZero('the mass of one drop', 1, 'g').default(DEFAULT_DROP_MASS_G),
  }),
], { error: 'Give the pigment as a percentage or in drops' });

export const MixTargetSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('total'), totalG: moreThanZero('the target mass', 100_000, 'g') }),
  z.object({ kind: z.literal('partA'), partAG: moreThanZero('the mass of part A', 100_000, 'g') }),
], { error: 'Give a total mass or a mass of part A' });

export const MixInputSchema = z
  .object({
    ratio: MixRatioSchema,
    softener: SoftenerDoseSchema.nullable().default(null),
    pigment: PigmentDoseSchema.nullable().default(null),
    target: MixTargetSchema,
    scaleResolutionG: moreThanZero('the scale resolution', 100, 'g').default(DEFAULT_SCALE_RESOLUTION_G),
  })
  .superRefine((v, ctx) => {
    const res = v.scaleResolutionG;
    if (!allPositive(res)) return;
    const targetPath = ['target', v.target.kind === 'total' ? 'totalG' : 'partAG'];
    const targetG = v.target.kind === 'total' ? v.target.totalG : v.target.partAG;
    if (targetG < res) {
      ctx.addIssue({ code: 'custom', path: targetPath, message: `Less than the scale can weigh (${res} g)` });
      return;
    }
    if (v.target.kind === 'total' && v.pigment?.kind === 'drops' && v.pigment.drops * v.pigment.dropMassG >= v.target.totalG) {
      ctx.addIssue({ code: 'custom', path: ['pigment', 'drops'], message: 'The drops alone weigh as much as the whole batch' });
      return;
    }
    if (!allPositive(v.ratio.partA, v.ratio.partB) || (v.softener && v.softener.percent > v.softener.makerMaxPercent)) return;
    const plan = mixForRun(v);
    for (const part of ['partA', 'partB'] as const) {
      if (plan.belowResolution.includes(part)) {
        ctx.addIssue({
          code: 'custom',
          path: targetPath,
          message: `${MIX_INGREDIENT_LABELS[part]} would come to 0 g on this scale: make a bigger batch or use a finer scale`,
        });
      }
    }
  });
export type MixInput = z.infer<typeof MixInputSchema>;

export const CoatingInputSchema = z.object({
  capParts: moreThanZero('the parts of cap material', 1000, 'parts'),
  solventParts: zeroOrMore('the parts of solvent', 1000, 'parts'),
  targetMl: moreThanZero('the amount to mix', 100_000, 'ml'),
});
export type CoatingInput = z.infer<typeof CoatingInputSchema>;

export const PiecesTallySchema = z
  .object({ made: wholeCount('pieces made'), used: wholeCount('pieces used'), spoiled: wholeCount('pieces spoiled') })
  .superRefine((v, ctx) => {
    if ([v.made, v.used, v.spoiled].every((n) => Number.isInteger(n) && n >= 0) && v.used + v.spoiled > v.made) {
      ctx.addIssue({ code: 'custom', path: ['used'], message: `Used and spoiled come to more than the ${v.made} made` });
    }
  });
export type PiecesTallyInput = z.infer<typeof PiecesTallySchema>;

export const SparesRuleSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('perDay'), sparesPerDay: wholeCount('spares per day', 100) }),
  z.object({ kind: z.literal('total'), spares: wholeCount('spares') }),
], { error: 'Give spares per day or a number of spares' });

export const PiecesShortfallInputSchema = z.object({
  remaining: wholeCount('pieces remaining'),
  shootDaysPlanned: wholeCount('shoot days planned', 1000),
  spares: SparesRuleSchema,
  piecesPerDay: moreThanZero('pieces per day', 100, 'pieces')
    .int('Pieces per day must be a whole number')
    .default(DEFAULT_PIECES_PER_DAY),
});
export type PiecesShortfallInput = z.infer<typeof PiecesShortfallInputSchema>;

export const DemoldInputSchema = z.object({
  dataSheetMinutes: moreThanZero("the data sheet's demold time", 10_080, 'minutes').nullable().default(null),
  defaultMinutes: moreThanZero('the default demold time', 10_080, 'minutes').default(PLATINUM_APPLIANCE_DEMOLD_MINUTES),
});
export type DemoldInput = z.infer<typeof DemoldInputSchema>;

function allPositive(...values: number[]): boolean {
  return values.every((n) => Number.isFinite(n) && n > 0);
}

function round1(n: number): number {
  return Math.round(n * 10) / 10;
}
