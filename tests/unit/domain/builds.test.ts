import { describe, expect, it } from 'vitest';
import {
  BUILD_CAUTIONS,
  buildDateRefusal,
  buildLotCheckMoment,
  buildMaterialProblems,
  materialFigureProblems,
  piecesMadeRefusal,
  sameRatio,
  tallyOfPieces,
  type BuildMaterialRef,
} from '#shared/domain/builds.ts';
import { lotExpired } from '#shared/domain/catalogue.ts';

const SILICONE = 'slipway';
const m = (role: BuildMaterialRef['role'], productId = SILICONE, lotId = `${role}-lot`): BuildMaterialRef => ({ role, productId, lotId });
const plain = { mix: { softener: null, pigment: null }, coating: null };

describe('buildMaterialProblems', () => {
  it('accepts one part A and one part B of the same material, lots alike or not', () => {
    expect(buildMaterialProblems([m('part_a'), m('part_b')], plain)).toEqual({});
    expect(buildMaterialProblems([m('part_a', SILICONE, 'lot-1'), m('part_b', SILICONE, 'lot-1')], plain)).toEqual({});
  });

  it('asks for part A and part B, and for each only once', () => {
    expect(buildMaterialProblems([], plain)).toEqual({ materials: ['Name the part A of the silicone and its lot', 'Name the part B of the silicone and its lot'] });
    expect(buildMaterialProblems([m('part_a'), m('part_b'), m('part_a', SILICONE, 'other')], plain)).toEqual({
      'materials.2.role': ['A batch has one part A: list the other material under its own role'],
    });
  });

  it('keeps part B to part A’s material, since the ratio is that material’s', () => {
    expect(buildMaterialProblems([m('part_a'), m('part_b', 'harbour')], plain)).toEqual({ 'materials.1.productId': ['Part B must be of the same material as part A'] });
  });

  it('asks for the softener and pigment a batch is dosed with, and takes one softener at most', () => {
    const dosed = { mix: { softener: { percent: 20, makerMaxPercent: 100 }, pigment: { kind: 'drops' as const, drops: 4, dropMassG: 0.03 } }, coating: null };
    expect(buildMaterialProblems([m('part_a'), m('part_b')], dosed)).toEqual({
      materials: ['The batch has softener in it: name the softener and its lot', 'The batch has pigment in it: name the pigment and its lot'],
    });
    expect(buildMaterialProblems([m('part_a'), m('part_b'), m('softener', 's', 's1'), m('softener', 't', 't1'), m('pigment', 'p')], dosed)).toEqual({ 'materials.3.role': ['A batch takes one softener'] });
    // A dose of nothing needs no material.
    const none = { mix: { softener: { percent: 0, makerMaxPercent: 100 }, pigment: { kind: 'percent' as const, percent: 0 } }, coating: null };
    expect(buildMaterialProblems([m('part_a'), m('part_b')], none)).toEqual({});
  });

  it('asks for the coating’s cap material, and its solvent only when it is thinned', () => {
    expect(buildMaterialProblems([m('part_a'), m('part_b')], { ...plain, coating: { solventParts: 8 } })).toEqual({
      materials: ['The coating needs its cap material and lot', 'The coating is thinned: name the solvent and its lot'],
    });
    expect(buildMaterialProblems([m('part_a'), m('part_b'), m('cap_material', 'cap')], { ...plain, coating: { solventParts: 0 } })).toEqual({});
  });

  it('names a lot listed twice under one role, but not a lot under two roles', () => {
    expect(buildMaterialProblems([m('part_a'), m('part_b'), m('pigment', 'p', 'x'), m('pigment', 'p', 'x')], plain)).toEqual({ 'materials.3.lotId': ['This lot is already listed as pigment'] });
  });
});

describe('materialFigureProblems', () => {
  const silicone = { name: 'Slipway', mixRatio: { partA: 1, partB: 1 }, makerMaxSoftenerPercent: 100 };
  it('accepts the catalogue’s ratio however it is written, and its maximum softener', () => {
    expect(materialFigureProblems(silicone, { ratio: { partA: 100, partB: 100 }, softener: { percent: 50, makerMaxPercent: 100 } })).toEqual({});
  });
  it('refuses another ratio or another maximum, naming the catalogue’s', () => {
    expect(materialFigureProblems(silicone, { ratio: { partA: 10, partB: 1 }, softener: { percent: 50, makerMaxPercent: 300 } })).toEqual({
      'mix.ratio.partA': ['The catalogue gives Slipway a ratio of 1 : 1'],
      'mix.softener.makerMaxPercent': ['The catalogue gives 100 % as the maker’s maximum for Slipway'],
    });
  });
  it('leaves the typed figures alone where the catalogue records none', () => {
    expect(materialFigureProblems({ name: 'Unknown', mixRatio: null, makerMaxSoftenerPercent: null }, { ratio: { partA: 10, partB: 1 }, softener: { percent: 5, makerMaxPercent: 5 } })).toEqual({});
  });
});

describe('sameRatio', () => {
  it('compares proportions, not the numbers typed', () => {
    expect(sameRatio({ partA: 1, partB: 1 }, { partA: 100, partB: 100 })).toBe(true);
    expect(sameRatio({ partA: 10, partB: 1 }, { partA: 100, partB: 10 })).toBe(true);
    expect(sameRatio({ partA: 1, partB: 1 }, { partA: 1, partB: 1.01 })).toBe(false);
  });
});

describe('pieces of a build', () => {
  it('are tallied from their statuses', () => {
    const pieces = [{ status: 'used' }, { status: 'used' }, { status: 'spoiled' }, { status: 'on_hand' }] as const;
    expect(tallyOfPieces(pieces)).toEqual({ made: 4, used: 2, spoiled: 1, remaining: 1 });
    expect(tallyOfPieces([])).toEqual({ made: 0, used: 0, spoiled: 0, remaining: 0 });
  });
  it('may be counted down only as far as those used or spoiled', () => {
    expect(piecesMadeRefusal(3, { made: 5, used: 2, spoiled: 1 })).toBeNull();
    expect(piecesMadeRefusal(2, { made: 5, used: 2, spoiled: 1 })).toBe('3 pieces are used or spoiled already, so at least 3 were made');
    expect(piecesMadeRefusal(0, { made: 5, used: 1, spoiled: 0 })).toBe('1 piece is used or spoiled already, so at least 1 was made');
  });
});

describe('the build’s date', () => {
  const now = new Date('2026-12-02T02:00:00Z');
  it('may be today anywhere on Earth, never a day not yet begun', () => {
    expect(buildDateRefusal('2026-12-02', now)).toBeNull();
    // At 02:00 UTC it is already 16:00 on 2 December in UTC+14 but not yet 3 December anywhere.
    expect(buildDateRefusal('2026-12-03', now)).toBe('A build cannot be dated in the future');
    expect(buildDateRefusal('2026-12-03', new Date('2026-12-02T10:00:00Z'))).toBeNull();
  });
  it('checks lots on the build’s day, so a lot on its last day is still in date', () => {
    expect(lotExpired('2026-11-30', buildLotCheckMoment('2026-11-30'))).toBe(false);
    expect(lotExpired('2026-11-30', buildLotCheckMoment('2026-12-01'))).toBe(true);
  });
});

describe('the cautions', () => {
  it('cover ventilation and a respirator, flames near solvents, gloves, and the data sheet over any rule of thumb', () => {
    const text = BUILD_CAUTIONS.items.join(' ');
    for (const words of ['ventilation', 'respirator', 'open flames', 'gloves', 'safety data sheet']) expect(text).toContain(words);
  });
});
