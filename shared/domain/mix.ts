/** A two-part material's parts by weight, as its maker states them (part A : part B). */
export interface MixRatio {
  partA: number;
  partB: number;
}

/** Weigh to a tenth of a gram unless the scale in use says otherwise: the default resolution, editable per scale. */
export const DEFAULT_SCALE_RESOLUTION_G = 0.1;

/** One drop of silicone pigment weighs about 0.03 g (common practice, no published source); the user sets their own. */
export const DEFAULT_DROP_MASS_G = 0.03;

/** What goes into an appliance batch: the two parts, and the softener and pigment blended into them. */
export type MixIngredient = 'partA' | 'softener' | 'pigment' | 'partB';

/**
 * The order to add them: everything is blended into part A before part B goes in, because meeting
 * part B starts the cure and the pot life (common practice, no published source).
 */
export const MIX_ORDER: readonly MixIngredient[] = ['partA', 'softener', 'pigment', 'partB'];

/** Each ingredient's name on screen and on a weigh-out sheet. */
export const MIX_INGREDIENT_LABELS: Record<MixIngredient, string> = {
  partA: 'Part A',
  softener: 'Softener',
  pigment: 'Pigment',
  partB: 'Part B',
};

/** Softener ("deadener") is dosed as a percentage of parts A and B combined, never above the maker's stated maximum. */
export interface SoftenerDose {
  percent: number;
  makerMaxPercent: number;
}

/** Pigment by weight as a percentage of parts A and B combined, or counted in drops of a set mass. */
export type PigmentDose = { kind: 'percent'; percent: number } | { kind: 'drops'; drops: number; dropMassG: number };

/** What the batch is sized from: everything in the cup, or the part A already weighed. */
export type MixTarget = { kind: 'total'; totalG: number } | { kind: 'partA'; partAG: number };

/** A batch to weigh out: the material's ratio, its additives, what to size it from and the scale it is weighed on. */
export interface MixInput {
  ratio: MixRatio;
  softener: SoftenerDose | null;
  pigment: PigmentDose | null;
  target: MixTarget;
  scaleResolutionG: number;
}

/** One line of the weigh-out, in the order of adding. */
export interface MixStep {
  ingredient: MixIngredient;
  /** Grams to weigh, rounded to the scale; for pigment in drops, the drops' estimated mass, rounded alike. */
  grams: number;
  /** Drops to count, when pigment is dosed in drops. */
  drops: number | null;
}

/** The weigh-out for a batch, rounded to the scale, with what the rounding cost. */
export interface MixPlan {
  /** In the order to add them (MIX_ORDER), only the ingredients asked for. */
  steps: MixStep[];
  /** The sum of the rounded amounts, in grams. */
  totalG: number;
  /** How far the rounded part B sits from the ratio against the rounded part A, in percent (+ is more B). */
  partBDriftPercent: number;
  /** Ingredients asked for that are too little for this scale to weigh (they rounded to 0 g); counted drops never are. */
  belowResolution: MixIngredient[];
}

/** A material's mass shared into its parts by the maker's ratio by weight. */
export function splitByRatio(totalG: number, ratio: MixRatio): { partAG: number; partBG: number } {
  const parts = ratio.partA + ratio.partB;
  return { partAG: (totalG * ratio.partA) / parts, partBG: (totalG * ratio.partB) / parts };
}

/** Decimal places a scale of this resolution shows (0.1 → 1, 0.05 → 2, 1 → 0). */
function decimalsOf(resolution: number): number {
  let d = 0;
  while (d < 9 && Math.abs(Math.round(resolution * 10 ** d) - resolution * 10 ** d) > 1e-9) d++;
  return d;
}

/** Whole scale steps nearest a mass; the 12-digit trim stops 0.15 / 0.1 = 1.4999… from rounding down. */
function scaleSteps(grams: number, resolution: number): number {
  return Math.round(Number((grams / resolution).toPrecision(12)));
}

function stepsToGrams(steps: number, resolution: number): number {
  return Number((steps * resolution).toFixed(decimalsOf(resolution)));
}

/** A mass rounded to what the scale can show, half a step rounding up. */
export function roundToScale(grams: number, resolution: number): number {
  return stepsToGrams(scaleSteps(grams, resolution), resolution);
}

/** Parts A and B combined, before rounding, that make up the target. */
function idealBaseG(input: MixInput): number {
  const { target, softener, pigment, ratio } = input;
  if (target.kind === 'partA') return (target.partAG * (ratio.partA + ratio.partB)) / ratio.partA;
  const softenerShare = (softener?.percent ?? 0) / 100;
  if (pigment?.kind === 'drops') return (target.totalG - pigment.drops * pigment.dropMassG) / (1 + softenerShare);
  const pigmentShare = pigment?.kind === 'percent' ? pigment.percent / 100 : 0;
  return target.totalG / (1 + softenerShare + pigmentShare);
}

/**
 * Grams of each ingredient for an appliance run, in the order to add them, rounded to the scale.
 * Part B is worked out from part A as rounded, not from the ideal, so the two weighed amounts
 * keep the ratio within half a scale step; softener and pigment follow the rounded A + B.
 * Expects input parsed by MixInputSchema.
 */
export function mixForRun(input: MixInput): MixPlan {
  const { ratio, softener, pigment, target, scaleResolutionG: res } = input;
  const idealA = target.kind === 'partA' ? target.partAG : splitByRatio(idealBaseG(input), ratio).partAG;
  const aSteps = scaleSteps(idealA, res);
  const bFromA = (stepsToGrams(aSteps, res) * ratio.partB) / ratio.partA;
  const bSteps = scaleSteps(bFromA, res);
  const baseG = stepsToGrams(aSteps + bSteps, res);

  const amounts = new Map<MixIngredient, { steps: number; drops: number | null }>();
  amounts.set('partA', { steps: aSteps, drops: null });
  if (softener && softener.percent > 0) {
    amounts.set('softener', { steps: scaleSteps((baseG * softener.percent) / 100, res), drops: null });
  }
  if (pigment?.kind === 'percent' && pigment.percent > 0) {
    amounts.set('pigment', { steps: scaleSteps((baseG * pigment.percent) / 100, res), drops: null });
  } else if (pigment?.kind === 'drops' && pigment.drops > 0) {
    amounts.set('pigment', { steps: scaleSteps(pigment.drops * pigment.dropMassG, res), drops: pigment.drops });
  }
  amounts.set('partB', { steps: bSteps, drops: null });

  const steps: MixStep[] = [];
  const belowResolution: MixIngredient[] = [];
  let totalSteps = 0;
  for (const ingredient of MIX_ORDER) {
    const amount = amounts.get(ingredient);
    if (!amount) continue;
    steps.push({ ingredient, grams: stepsToGrams(amount.steps, res), drops: amount.drops });
    totalSteps += amount.steps;
    if (amount.steps === 0 && amount.drops === null) belowResolution.push(ingredient);
  }
  const roundedB = stepsToGrams(bSteps, res);
  return {
    steps,
    totalG: stepsToGrams(totalSteps, res),
    partBDriftPercent: bFromA > 0 ? ((roundedB - bFromA) / bFromA) * 100 : 0,
    belowResolution,
  };
}
