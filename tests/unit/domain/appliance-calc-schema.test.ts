import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { coatingVolumes } from '#shared/domain/coating.ts';
import { demoldTime } from '#shared/domain/cure.ts';
import { mixForRun } from '#shared/domain/mix.ts';
import { moldBox } from '#shared/domain/mold-box.ts';
import { piecesRemaining, piecesShortfall } from '#shared/domain/pieces.ts';
import { fieldErrorsFromIssues, type FieldErrors } from '#shared/errors.ts';
import {
  CoatingInputSchema,
  DemoldInputSchema,
  MixInputSchema,
  MoldBoxInputSchema,
  PiecesShortfallInputSchema,
  PiecesTallySchema,
} from '#shared/schemas/appliance-calc.ts';

function refusal(schema: z.ZodType, value: unknown): FieldErrors {
  const r = schema.safeParse(value);
  if (r.success) throw new Error(`expected a refusal for ${JSON.stringify(value)}`);
  return fieldErrorsFromIssues(r.error.issues);
}

const mold = (p: Record<string, unknown> = {}) => ({
  footprintLengthMm: 120,
  footprintWidthMm: 80,
  highestPointMm: 25,
  sculpt: { kind: 'measured', volumeCm3: 100 },
  densityGPerCm3: 1.08,
  ratio: { partA: 1, partB: 1 },
  ...p,
});

const mix = (p: Record<string, unknown> = {}) => ({ ratio: { partA: 1, partB: 1 }, target: { kind: 'partA', partAG: 15 }, ...p });

describe('MoldBoxInputSchema', () => {
  it('fills in the rules of thumb and hands the domain a box it can compute', () => {
    const parsed = MoldBoxInputSchema.parse(mold());
    expect(parsed).toMatchObject({ wallClearanceMm: 10, coverMm: 10 });
    expect(moldBox(parsed).pourHeightMm).toBe(35);
  });

  it('refuses a footprint of zero', () => {
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ footprintLengthMm: 0 })))).toEqual(['footprintLengthMm']);
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ footprintWidthMm: 0 })))).toEqual(['footprintWidthMm']);
  });

  it('refuses a highest point at or below the board', () => {
    expect(refusal(MoldBoxInputSchema, mold({ highestPointMm: 0 }))).toEqual({ highestPointMm: ['The highest point must be more than 0'] });
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ highestPointMm: -4 })))).toEqual(['highestPointMm']);
  });

  it('refuses a sculpt volume larger than the box', () => {
    // the box is 140 × 100 × 35 mm = 490 cm³
    const errors = refusal(MoldBoxInputSchema, mold({ sculpt: { kind: 'measured', volumeCm3: 600 } }));
    expect(errors['sculpt.volumeCm3']?.[0]).toMatch(/more than the mold box holds/);
  });

  it('refuses a sculpt volume its footprint and highest point could not hold, even inside the box', () => {
    // 120 × 80 × 25 mm = 240 cm³ at most; 300 cm³ would still fit the 490 cm³ box
    const errors = refusal(MoldBoxInputSchema, mold({ sculpt: { kind: 'measured', volumeCm3: 300 } }));
    expect(errors['sculpt.volumeCm3']?.[0]).toMatch(/at most 240 cm³/);
    expect(MoldBoxInputSchema.safeParse(mold({ sculpt: { kind: 'measured', volumeCm3: 240 } })).success).toBe(true);
  });

  it('refuses a sculpt volume of zero or less', () => {
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ sculpt: { kind: 'measured', volumeCm3: 0 } })))).toEqual(['sculpt.volumeCm3']);
  });

  it('refuses a shape it does not know', () => {
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ sculpt: { kind: 'shape', shape: 'cone' } })))).toEqual(['sculpt.shape']);
  });

  it('refuses a ratio of zero or a negative part', () => {
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ ratio: { partA: 0, partB: 1 } })))).toEqual(['ratio.partA']);
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ ratio: { partA: 1, partB: -1 } })))).toEqual(['ratio.partB']);
  });

  it('refuses a density, wall clearance or cover of zero or less', () => {
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ densityGPerCm3: 0 })))).toEqual(['densityGPerCm3']);
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ wallClearanceMm: -1 })))).toEqual(['wallClearanceMm']);
    expect(Object.keys(refusal(MoldBoxInputSchema, mold({ coverMm: 0 })))).toEqual(['coverMm']);
  });

  it('names each missing field', () => {
    const errors = refusal(MoldBoxInputSchema, {});
    expect(Object.keys(errors).sort()).toEqual(['densityGPerCm3', 'footprintLengthMm', 'footprintWidthMm', 'highestPointMm', 'ratio', 'sculpt']);
  });
});

describe('MixInputSchema', () => {
  it('fills in a 0.1 g scale and no additives, and hands the domain a batch it can weigh', () => {
    const parsed = MixInputSchema.parse(mix());
    expect(parsed).toMatchObject({ scaleResolutionG: 0.1, softener: null, pigment: null });
    expect(mixForRun(parsed).totalG).toBe(30);
  });

  it('fills in 0.03 g a drop', () => {
    // common practice, no published source
    expect(MixInputSchema.parse(mix({ pigment: { kind: 'drops', drops: 4 } })).pigment).toEqual({ kind: 'drops', drops: 4, dropMassG: 0.03 });
  });

  it('refuses a ratio of zero or a negative part', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ ratio: { partA: 0, partB: 1 } })))).toEqual(['ratio.partA']);
    expect(Object.keys(refusal(MixInputSchema, mix({ ratio: { partA: 1, partB: -2 } })))).toEqual(['ratio.partB']);
  });

  it('refuses softener over the maker’s stated maximum and takes it at the maximum', () => {
    expect(refusal(MixInputSchema, mix({ softener: { percent: 40, makerMaxPercent: 30 } }))).toEqual({
      'softener.percent': ['At most 30 %, the maker\'s stated maximum'],
    });
    expect(MixInputSchema.safeParse(mix({ softener: { percent: 30, makerMaxPercent: 30 } })).success).toBe(true);
  });

  it('refuses a negative softener, pigment or drop count, and a part drop', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ softener: { percent: -5, makerMaxPercent: 30 } })))).toEqual(['softener.percent']);
    expect(Object.keys(refusal(MixInputSchema, mix({ pigment: { kind: 'percent', percent: -1 } })))).toEqual(['pigment.percent']);
    expect(Object.keys(refusal(MixInputSchema, mix({ pigment: { kind: 'drops', drops: -1 } })))).toEqual(['pigment.drops']);
    expect(Object.keys(refusal(MixInputSchema, mix({ pigment: { kind: 'drops', drops: 1.5 } })))).toEqual(['pigment.drops']);
    expect(Object.keys(refusal(MixInputSchema, mix({ pigment: { kind: 'drops', drops: 2, dropMassG: 0 } })))).toEqual(['pigment.dropMassG']);
  });

  it('refuses a negative or zero target', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ target: { kind: 'total', totalG: -10 } })))).toEqual(['target.totalG']);
    expect(Object.keys(refusal(MixInputSchema, mix({ target: { kind: 'partA', partAG: 0 } })))).toEqual(['target.partAG']);
  });

  it('refuses a target smaller than the scale can weigh', () => {
    expect(refusal(MixInputSchema, mix({ target: { kind: 'total', totalG: 0.05 } }))).toEqual({ 'target.totalG': ['Less than the scale can weigh (0.1 g)'] });
    expect(Object.keys(refusal(MixInputSchema, mix({ target: { kind: 'partA', partAG: 0.5 }, scaleResolutionG: 1 })))).toEqual(['target.partAG']);
    expect(MixInputSchema.safeParse(mix({ target: { kind: 'total', totalG: 0.2 } })).success).toBe(true);
  });

  it('refuses a batch so small that a part would weigh nothing on the scale', () => {
    // 1 g of a 100 : 1 material holds 0.0099 g of part B, under half a 0.1 g step
    const errors = refusal(MixInputSchema, mix({ ratio: { partA: 100, partB: 1 }, target: { kind: 'total', totalG: 1 } }));
    expect(errors['target.totalG']?.[0]).toMatch(/^Part B would come to 0 g/);
  });

  it('refuses drops that alone outweigh the batch', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ target: { kind: 'total', totalG: 0.3 }, pigment: { kind: 'drops', drops: 10 } })))).toEqual(['pigment.drops']);
  });

  it('refuses a scale resolution of zero', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ scaleResolutionG: 0 })))).toEqual(['scaleResolutionG']);
  });

  it('refuses a target given neither as a total nor as part A', () => {
    expect(Object.keys(refusal(MixInputSchema, mix({ target: { kind: 'partB', partBG: 5 } })))).toEqual(['target.kind']);
  });
});

describe('CoatingInputSchema', () => {
  it('hands the domain a dilution it can measure', () => {
    const parsed = CoatingInputSchema.parse({ capParts: 1, solventParts: 8, targetMl: 90 });
    expect(coatingVolumes(parsed, parsed.targetMl).solventMl).toBeCloseTo(80, 12);
  });

  it('refuses no cap material, negative solvent and a target of zero', () => {
    expect(Object.keys(refusal(CoatingInputSchema, { capParts: 0, solventParts: 8, targetMl: 90 }))).toEqual(['capParts']);
    expect(Object.keys(refusal(CoatingInputSchema, { capParts: 1, solventParts: -8, targetMl: 90 }))).toEqual(['solventParts']);
    expect(Object.keys(refusal(CoatingInputSchema, { capParts: 1, solventParts: 8, targetMl: 0 }))).toEqual(['targetMl']);
  });
});

describe('PiecesTallySchema', () => {
  it('hands the domain a tally it can count', () => {
    expect(piecesRemaining(PiecesTallySchema.parse({ made: 20, used: 6, spoiled: 2 }))).toBe(12);
  });

  it('refuses more pieces used and spoiled than were made', () => {
    expect(refusal(PiecesTallySchema, { made: 5, used: 4, spoiled: 2 })).toEqual({ used: ['Used and spoiled come to more than the 5 made'] });
  });

  it('refuses negative and part pieces', () => {
    expect(Object.keys(refusal(PiecesTallySchema, { made: -1, used: 0, spoiled: 0 }))).toEqual(['made']);
    expect(Object.keys(refusal(PiecesTallySchema, { made: 3, used: 1.5, spoiled: 0 }))).toEqual(['used']);
  });
});

describe('PiecesShortfallInputSchema', () => {
  it('fills in one piece a day and hands the domain a plan it can check', () => {
    const parsed = PiecesShortfallInputSchema.parse({ remaining: 12, shootDaysPlanned: 10, spares: { kind: 'perDay', sparesPerDay: 1 } });
    expect(parsed.piecesPerDay).toBe(1);
    expect(piecesShortfall(parsed.remaining, parsed.shootDaysPlanned, parsed.spares, parsed.piecesPerDay).shortBy).toBe(8);
  });

  it('refuses negative counts and zero pieces a day', () => {
    expect(Object.keys(refusal(PiecesShortfallInputSchema, { remaining: -1, shootDaysPlanned: 2, spares: { kind: 'total', spares: 1 } }))).toEqual(['remaining']);
    expect(Object.keys(refusal(PiecesShortfallInputSchema, { remaining: 1, shootDaysPlanned: 2, spares: { kind: 'total', spares: -1 } }))).toEqual(['spares.spares']);
    expect(Object.keys(refusal(PiecesShortfallInputSchema, { remaining: 1, shootDaysPlanned: 2, spares: { kind: 'perDay', sparesPerDay: 1 }, piecesPerDay: 0 }))).toEqual(['piecesPerDay']);
  });
});

describe('DemoldInputSchema', () => {
  it('fills in the 30-minute default and no data sheet figure', () => {
    // common practice, no published source
    const parsed = DemoldInputSchema.parse({});
    expect(demoldTime(parsed.dataSheetMinutes, parsed.defaultMinutes)).toEqual({ minutes: 30, source: 'default' });
  });

  it('refuses a demold time of zero', () => {
    expect(Object.keys(refusal(DemoldInputSchema, { dataSheetMinutes: 0 }))).toEqual(['dataSheetMinutes']);
  });
});
