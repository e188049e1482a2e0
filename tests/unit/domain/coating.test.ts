import Qty from 'js-quantities';
import { describe, expect, it } from 'vitest';
import { coatingVolumes } from '#shared/domain/coating.ts';

describe('coatingVolumes', () => {
  it('thins 1 part to 8 parts solvent: 9 parts in all, so 90 ml holds 10 ml of cap material and 80 ml of solvent', () => {
    // common practice, no published source
    const v = coatingVolumes({ capParts: 1, solventParts: 8 }, 90);
    expect(v.capMl).toBeCloseTo(10, 12);
    expect(v.solventMl).toBeCloseTo(80, 12);
  });

  it('measures out exactly the target amount', () => {
    const v = coatingVolumes({ capParts: 1, solventParts: 8 }, 90);
    // ml ↔ l checked with js-quantities
    expect(Qty(v.capMl, 'ml').add(Qty(v.solventMl, 'ml')).to('l').scalar).toBeCloseTo(Qty('0.09 l').scalar, 12);
    expect(v.totalMl).toBe(90);
  });

  it('shares any dilution by its parts', () => {
    // 2 + 3 = 5 parts; 50 ml ÷ 5 = 10 ml a part
    const v = coatingVolumes({ capParts: 2, solventParts: 3 }, 50);
    expect(v.capMl).toBeCloseTo(20, 12);
    expect(v.solventMl).toBeCloseTo(30, 12);
  });

  it('leaves an unthinned coating all cap material', () => {
    expect(coatingVolumes({ capParts: 1, solventParts: 0 }, 40)).toEqual({ capMl: 40, solventMl: 0, totalMl: 40 });
  });
});
