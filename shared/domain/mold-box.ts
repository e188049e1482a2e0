import { splitByRatio, type MixRatio } from './mix.ts';

/*
 * Units: every length is entered in millimetres (a sculpt is measured with a rule or calipers),
 * every volume comes out in cm³, which is the same as ml, and every mass in grams.
 */

const MM3_PER_CM3 = 1000;

/** Shapes whose volume estimates a sculpt's when it has not been measured. */
export const SCULPT_SHAPES = ['half-ellipsoid', 'half-cylinder', 'box'] as const;
/** One of SCULPT_SHAPES. */
export type SculptShape = (typeof SCULPT_SHAPES)[number];

/** How each shape choice estimates a sculpt's volume from its footprint L × W and highest point H. */
export const SCULPT_SHAPE_FORMULAS: Record<SculptShape, { label: string; formula: string }> = {
  'half-ellipsoid': {
    label: 'Dome (half-ellipsoid)',
    formula: 'π × L × W × H ÷ 6: half the ellipsoid ⁴⁄₃·π·a·b·c with semi-axes a = L/2, b = W/2, c = H',
  },
  'half-cylinder': {
    label: 'Ridge (half-cylinder along the length)',
    formula: 'π × L × W × H ÷ 4: a half-ellipse W wide and H high, run along the length L',
  },
  box: { label: 'Block (box)', formula: 'L × W × H' },
};

/**
 * Rules of thumb for a mold box, editable per build: the walls stand at least about 1 cm clear of
 * the flashing edge, and about 1 cm of silicone covers the highest point (common practice, no published source).
 */
export const MOLD_BOX_DEFAULTS = { wallClearanceMm: 10, coverMm: 10 } as const;

/** A sculpt's volume as measured in cm³, or as a shape estimates it from the footprint and highest point. */
export type SculptVolume = { kind: 'measured'; volumeCm3: number } | { kind: 'shape'; shape: SculptShape };

/** A sculpt's measurements, the box rules of thumb and the mold material's density and ratio. */
export interface MoldBoxInput {
  /** Footprint to the outer edge of the flashing, in mm. */
  footprintLengthMm: number;
  footprintWidthMm: number;
  /** Height of the sculpt's highest point above the board, in mm. */
  highestPointMm: number;
  sculpt: SculptVolume;
  wallClearanceMm: number;
  coverMm: number;
  /** Density of the mixed mold material, g/cm³, from its product record. */
  densityGPerCm3: number;
  ratio: MixRatio;
}

/** The box to build around a sculpt and the silicone to pour into it. */
export interface MoldBoxPlan {
  innerLengthMm: number;
  innerWidthMm: number;
  /** Height of the silicone's surface above the board; the walls must stand at least this tall. */
  pourHeightMm: number;
  /** Inside of the box up to the pour height, cm³. */
  boxVolumeCm3: number;
  sculptVolumeCm3: number;
  /** Silicone to fill the box around the sculpt, cm³ (= ml). */
  siliconeVolumeCm3: number;
  siliconeMassG: number;
  partAG: number;
  partBG: number;
}

/** A sculpt's volume estimated from its shape, footprint and highest point (formulas in SCULPT_SHAPE_FORMULAS), in cm³. */
export function shapeVolumeCm3(shape: SculptShape, lengthMm: number, widthMm: number, heightMm: number): number {
  const block = lengthMm * widthMm * heightMm;
  const mm3 = shape === 'half-ellipsoid' ? (Math.PI * block) / 6 : shape === 'half-cylinder' ? (Math.PI * block) / 4 : block;
  return mm3 / MM3_PER_CM3;
}

/** The most a sculpt can displace: the block its own footprint and highest point enclose, in cm³. */
export function maxSculptVolumeCm3(lengthMm: number, widthMm: number, heightMm: number): number {
  return shapeVolumeCm3('box', lengthMm, widthMm, heightMm);
}

/** The sculpt's volume as measured (for example by water displacement) or as its shape estimates it, in cm³. */
export function sculptVolumeCm3(input: Pick<MoldBoxInput, 'footprintLengthMm' | 'footprintWidthMm' | 'highestPointMm' | 'sculpt'>): number {
  return input.sculpt.kind === 'measured'
    ? input.sculpt.volumeCm3
    : shapeVolumeCm3(input.sculpt.shape, input.footprintLengthMm, input.footprintWidthMm, input.highestPointMm);
}

/** Inner box size with the wall clearance on every side of the footprint, and the pour height with the cover over the highest point. */
export function moldBoxSize(input: Pick<MoldBoxInput, 'footprintLengthMm' | 'footprintWidthMm' | 'highestPointMm' | 'wallClearanceMm' | 'coverMm'>) {
  const innerLengthMm = input.footprintLengthMm + 2 * input.wallClearanceMm;
  const innerWidthMm = input.footprintWidthMm + 2 * input.wallClearanceMm;
  const pourHeightMm = input.highestPointMm + input.coverMm;
  return { innerLengthMm, innerWidthMm, pourHeightMm, boxVolumeCm3: (innerLengthMm * innerWidthMm * pourHeightMm) / MM3_PER_CM3 };
}

/**
 * The mold box for a sculpt and the silicone to fill it: box volume less the sculpt's, weighed by
 * the material's density and shared into its parts by its ratio. Expects input parsed by MoldBoxInputSchema.
 */
export function moldBox(input: MoldBoxInput): MoldBoxPlan {
  const size = moldBoxSize(input);
  const sculpt = sculptVolumeCm3(input);
  const siliconeVolumeCm3 = size.boxVolumeCm3 - sculpt;
  const siliconeMassG = siliconeVolumeCm3 * input.densityGPerCm3;
  return { ...size, sculptVolumeCm3: sculpt, siliconeVolumeCm3, siliconeMassG, ...splitByRatio(siliconeMassG, input.ratio) };
}
