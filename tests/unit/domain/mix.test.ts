import Qty from 'js-quantities';
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_DROP_MASS_G,
  DEFAULT_SCALE_RESOLUTION_G,
  MIX_ORDER,
  mixForRun,
  roundToScale,
  splitByRatio,
  type MixInput,
  type MixPlan,
} from '#shared/domain/mix.ts';

function input(p: Partial<MixInput>): MixInput {
  return { ratio: { partA: 1, partB: 1 }, softener: null, pigment: null, target: { kind: 'partA', partAG: 15 }, scaleResolutionG: 0.1, ...p };
}

const grams = (plan: MixPlan, ingredient: string) => plan.steps.find((s) => s.ingredient === ingredient)?.grams;

describe('splitByRatio', () => {
  it('shares a mass into parts by weight', () => {
    const { partAG, partBG } = splitByRatio(55, { partA: 10, partB: 1 });
    expect(partAG).toBeCloseTo(50, 12);
    expect(partBG).toBeCloseTo(5, 12);
  });
});

describe('roundToScale', () => {
  it('rounds to the nearest step the scale shows, half a step up', () => {
    expect(roundToScale(15.04, 0.1)).toBe(15);
    expect(roundToScale(0.15, 0.1)).toBe(0.2);
    expect(roundToScale(1.25, 0.5)).toBe(1.5);
    expect(roundToScale(12.34, 0.05)).toBe(12.35);
    expect(roundToScale(15.4, 1)).toBe(15);
  });
});

describe('mixForRun', () => {
  it('pairs 15 g of part A with 15 g of part B for a 1 : 1 material', () => {
    // common practice, no published source
    const plan = mixForRun(input({}));
    expect(grams(plan, 'partA')).toBe(15);
    expect(grams(plan, 'partB')).toBe(15);
    expect(plan.totalG).toBe(30);
  });

  it('gives softener at 100 % the mass of parts A and B combined: 15 g + 15 g takes 30 g', () => {
    // common practice, no published source
    const plan = mixForRun(input({ softener: { percent: 100, makerMaxPercent: 100 } }));
    expect(grams(plan, 'softener')).toBe(30);
    expect(plan.totalG).toBe(60);
  });

  it('lists part A, then softener, then pigment, and part B last because it starts the cure', () => {
    // common practice, no published source
    expect(MIX_ORDER).toEqual(['partA', 'softener', 'pigment', 'partB']);
    const plan = mixForRun(input({ softener: { percent: 20, makerMaxPercent: 50 }, pigment: { kind: 'percent', percent: 2 } }));
    expect(plan.steps.map((s) => s.ingredient)).toEqual(['partA', 'softener', 'pigment', 'partB']);
  });

  it('leaves out the additives not asked for', () => {
    const plan = mixForRun(input({ softener: { percent: 0, makerMaxPercent: 50 } }));
    expect(plan.steps.map((s) => s.ingredient)).toEqual(['partA', 'partB']);
  });

  it('doses pigment as a percentage of parts A and B combined', () => {
    const plan = mixForRun(input({ pigment: { kind: 'percent', percent: 2 } }));
    // 2 % of 30 g = 0.6 g
    expect(grams(plan, 'pigment')).toBe(0.6);
  });

  it('counts pigment in drops at 0.03 g a drop unless the user sets their own', () => {
    // common practice, no published source
    expect(DEFAULT_DROP_MASS_G).toBe(0.03);
    const plan = mixForRun(input({ pigment: { kind: 'drops', drops: 10, dropMassG: DEFAULT_DROP_MASS_G } }));
    expect(plan.steps.find((s) => s.ingredient === 'pigment')).toEqual({ ingredient: 'pigment', grams: 0.3, drops: 10 });
    expect(plan.belowResolution).toEqual([]);
    const heavier = mixForRun(input({ pigment: { kind: 'drops', drops: 10, dropMassG: 0.05 } }));
    expect(grams(heavier, 'pigment')).toBe(0.5);
  });

  it('sizes a batch from a total that includes the softener and pigment', () => {
    // parts A + B = 100 g ÷ (1 + 0.20 + 0.02) = 81.97 g, so part A = 40.98 g → 41.0 g, part B follows at 41.0 g;
    // softener 20 % of 82.0 g = 16.4 g; pigment 2 % of 82.0 g = 1.64 g → 1.6 g; 41 + 16.4 + 1.6 + 41 = 100.0 g
    const plan = mixForRun(input({ target: { kind: 'total', totalG: 100 }, softener: { percent: 20, makerMaxPercent: 30 }, pigment: { kind: 'percent', percent: 2 } }));
    expect(plan.steps.map((s) => s.grams)).toEqual([41, 16.4, 1.6, 41]);
    expect(plan.totalG).toBe(100);
  });

  it('takes the drops out of a total before sharing the rest', () => {
    // 30.3 g less 10 drops × 0.03 g leaves 30 g of parts A + B
    const plan = mixForRun(input({ target: { kind: 'total', totalG: 30.3 }, pigment: { kind: 'drops', drops: 10, dropMassG: 0.03 } }));
    expect(grams(plan, 'partA')).toBe(15);
    expect(grams(plan, 'partB')).toBe(15);
    expect(plan.totalG).toBe(30.3);
  });

  it('sizes a 10 : 1 material from its total', () => {
    const plan = mixForRun(input({ ratio: { partA: 10, partB: 1 }, target: { kind: 'total', totalG: 55 } }));
    expect(grams(plan, 'partA')).toBe(50);
    expect(grams(plan, 'partB')).toBe(5);
  });

  it('works part B out from the part A as rounded, so the weighed parts keep the ratio within half a step', () => {
    for (const ratio of [
      { partA: 1, partB: 1 },
      { partA: 10, partB: 1 },
      { partA: 100, partB: 45 },
      { partA: 1, partB: 2 },
    ]) {
      for (const totalG of [3.3, 17.77, 48.05, 123.456]) {
        for (const res of [0.1, 0.5, 0.01]) {
          const plan = mixForRun(input({ ratio, target: { kind: 'total', totalG }, scaleResolutionG: res }));
          const a = grams(plan, 'partA')!;
          const b = grams(plan, 'partB')!;
          const bFromA = (a * ratio.partB) / ratio.partA;
          expect(Math.abs(b - bFromA)).toBeLessThanOrEqual(res / 2 + 1e-9);
          expect(Math.abs(plan.partBDriftPercent)).toBeCloseTo((Math.abs(b - bFromA) / bFromA) * 100, 9);
          expect(Math.abs(a - (totalG * ratio.partA) / (ratio.partA + ratio.partB))).toBeLessThanOrEqual(res / 2 + 1e-9);
        }
      }
    }
  });

  it('rounds every amount to the scale and reports the total of what is weighed', () => {
    const plan = mixForRun(input({ target: { kind: 'total', totalG: 47.3 }, ratio: { partA: 10, partB: 1 }, scaleResolutionG: 0.5 }));
    for (const step of plan.steps) expect(Number.isInteger(Number((step.grams / 0.5).toFixed(9)))).toBe(true);
    const sum = plan.steps.reduce((n, s) => n + s.grams, 0);
    expect(plan.totalG).toBeCloseTo(sum, 9);
  });

  it('reads to a tenth of a gram unless told otherwise', () => {
    expect(DEFAULT_SCALE_RESOLUTION_G).toBe(0.1);
  });

  it('flags an additive too small for the scale to weigh', () => {
    // 0.1 % of 30 g is 0.03 g, under half of a 0.1 g step
    const plan = mixForRun(input({ pigment: { kind: 'percent', percent: 0.1 } }));
    expect(grams(plan, 'pigment')).toBe(0);
    expect(plan.belowResolution).toEqual(['pigment']);
  });

  it('reports the masses in grams that the units library agrees make up the batch', () => {
    const plan = mixForRun(input({ softener: { percent: 100, makerMaxPercent: 100 } }));
    // g ↔ kg bookkeeping checked with js-quantities
    const total = plan.steps.reduce((q, s) => q.add(Qty(s.grams, 'g')), Qty(0, 'g'));
    expect(total.to('kg').scalar).toBeCloseTo(Qty(plan.totalG, 'g').to('kg').scalar, 12);
  });
});
