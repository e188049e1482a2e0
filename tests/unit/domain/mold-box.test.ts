import Qty from 'js-quantities';
import { describe, expect, it } from 'vitest';
import { mixForRun } from '#shared/domain/mix.ts';
import {
  MOLD_BOX_DEFAULTS,
  maxSculptVolumeCm3,
  moldBox,
  moldBoxSize,
  shapeVolumeCm3,
  type MoldBoxInput,
} from '#shared/domain/mold-box.ts';

function input(p: Partial<MoldBoxInput> = {}): MoldBoxInput {
  return {
    footprintLengthMm: 120,
    footprintWidthMm: 80,
    highestPointMm: 25,
    sculpt: { kind: 'measured', volumeCm3: 100 },
    wallClearanceMm: 10,
    coverMm: 10,
    densityGPerCm3: 1.08,
    ratio: { partA: 1, partB: 1 },
    ...p,
  };
}

/** mm × mm × mm to cm³, worked by js-quantities (an independent units library). */
const cm3 = (l: number, w: number, h: number) => Qty(l, 'mm').mul(Qty(w, 'mm')).mul(Qty(h, 'mm')).to('cm^3').scalar;

/** Volume under a height field over the footprint, by the midpoint rule on an n × n grid. */
function integrateHeightField(lengthMm: number, widthMm: number, height: (x: number, y: number) => number, n = 1000): number {
  const dx = lengthMm / n;
  const dy = widthMm / n;
  let mm3 = 0;
  for (let i = 0; i < n; i++) {
    const x = -lengthMm / 2 + (i + 0.5) * dx;
    for (let j = 0; j < n; j++) mm3 += height(x, -widthMm / 2 + (j + 0.5) * dy) * dx * dy;
  }
  return mm3 / 1000;
}

describe('the mold-box rules of thumb', () => {
  it('default to 1 cm between the flashing edge and the wall, and 1 cm of silicone over the highest point', () => {
    // common practice, no published source
    expect(Qty(MOLD_BOX_DEFAULTS.wallClearanceMm, 'mm').eq(Qty('1 cm'))).toBe(true);
    // common practice, no published source
    expect(Qty(MOLD_BOX_DEFAULTS.coverMm, 'mm').eq(Qty('1 cm'))).toBe(true);
  });

  it('put the wall clearance on both sides of the footprint and the cover over the highest point', () => {
    const size = moldBoxSize(input());
    expect(size.innerLengthMm).toBe(120 + 2 * 10);
    expect(size.innerWidthMm).toBe(80 + 2 * 10);
    expect(size.pourHeightMm).toBe(25 + 10);
  });

  it('follow edited rules', () => {
    const size = moldBoxSize(input({ wallClearanceMm: 15, coverMm: 6 }));
    expect([size.innerLengthMm, size.innerWidthMm, size.pourHeightMm]).toEqual([150, 110, 31]);
  });

  it('give the box volume in cm³ from lengths in mm', () => {
    // mm³ → cm³ checked with js-quantities
    expect(moldBoxSize(input()).boxVolumeCm3).toBeCloseTo(cm3(140, 100, 35), 9);
  });

  it('give the same box for a footprint measured in cm and entered in mm', () => {
    // cm → mm checked with js-quantities
    const fromCm = input({ footprintLengthMm: Qty('12 cm').to('mm').scalar, footprintWidthMm: Qty('8 cm').to('mm').scalar });
    expect(moldBox(fromCm).boxVolumeCm3).toBeCloseTo(moldBox(input()).boxVolumeCm3, 9);
  });
});

describe('sculpt volume from a shape', () => {
  it('box: length × width × height, in cm³', () => {
    // mm³ → cm³ checked with js-quantities
    expect(shapeVolumeCm3('box', 120, 80, 25)).toBeCloseTo(cm3(120, 80, 25), 9);
  });

  it('dome: half an ellipsoid, matching the ellipsoid volume 4/3·π·a·b·c halved', () => {
    // ellipsoid volume V = 4/3·π·a·b·c (standard solid-geometry formula), semi-axes a = L/2, b = W/2, c = H
    const a = 60;
    const b = 40;
    const c = 25;
    expect(shapeVolumeCm3('half-ellipsoid', 120, 80, 25)).toBeCloseTo(((4 / 3) * Math.PI * a * b * c) / 2 / 1000, 9);
  });

  it('dome: agrees with numeric integration of the dome surface over its footprint', () => {
    // independent check: midpoint-rule integration of z = H·√(1 − (2x/L)² − (2y/W)²)
    const dome = (x: number, y: number) => {
      const r = 1 - (x / 60) ** 2 - (y / 40) ** 2;
      return r > 0 ? 25 * Math.sqrt(r) : 0;
    };
    const numeric = integrateHeightField(120, 80, dome);
    expect(Math.abs(shapeVolumeCm3('half-ellipsoid', 120, 80, 25) - numeric) / numeric).toBeLessThan(0.001);
  });

  it('ridge: agrees with numeric integration of a half-ellipse cross-section run along the length', () => {
    // independent check: midpoint-rule integration of z = H·√(1 − (2y/W)²)
    const ridge = (_x: number, y: number) => {
      const r = 1 - (y / 40) ** 2;
      return r > 0 ? 25 * Math.sqrt(r) : 0;
    };
    const numeric = integrateHeightField(120, 80, ridge);
    expect(Math.abs(shapeVolumeCm3('half-cylinder', 120, 80, 25) - numeric) / numeric).toBeLessThan(0.001);
  });

  it('ridge: a true half-cylinder (height = half the width) is π·r²·L ÷ 2', () => {
    // cylinder volume V = π·r²·L (standard solid-geometry formula), halved
    expect(shapeVolumeCm3('half-cylinder', 120, 80, 40)).toBeCloseTo((Math.PI * 40 ** 2 * 120) / 2 / 1000, 9);
  });

  it('never comes to more than the block its footprint and highest point enclose', () => {
    const most = maxSculptVolumeCm3(120, 80, 25);
    expect(shapeVolumeCm3('half-ellipsoid', 120, 80, 25)).toBeLessThan(most);
    expect(shapeVolumeCm3('half-cylinder', 120, 80, 25)).toBeLessThan(most);
    expect(shapeVolumeCm3('box', 120, 80, 25)).toBe(most);
  });
});

describe('moldBox', () => {
  it('fills the box less the sculpt with silicone, in cm³ that are ml', () => {
    const plan = moldBox(input());
    // mm³ → cm³ and cm³ → ml checked with js-quantities
    const expected = Qty(cm3(140, 100, 35), 'cm^3').sub(Qty(100, 'cm^3')).to('ml').scalar;
    expect(plan.siliconeVolumeCm3).toBeCloseTo(expected, 9);
    expect(plan.sculptVolumeCm3).toBe(100);
  });

  it('uses the shape estimate when the volume was not measured', () => {
    const plan = moldBox(input({ sculpt: { kind: 'shape', shape: 'box' } }));
    // mm³ → cm³ checked with js-quantities
    expect(plan.siliconeVolumeCm3).toBeCloseTo(cm3(140, 100, 35) - cm3(120, 80, 25), 9);
  });

  it('weighs the silicone by the density of the product', () => {
    const plan = moldBox(input({ densityGPerCm3: 1.08 }));
    // volume × density → mass checked with js-quantities
    const mass = Qty('1.08 g/cm^3').mul(Qty(plan.siliconeVolumeCm3, 'ml')).to('g').scalar;
    expect(plan.siliconeMassG).toBeCloseTo(mass, 9);
  });

  it('shares a 1 : 1 material into equal parts', () => {
    const plan = moldBox(input());
    expect(plan.partAG).toBeCloseTo(plan.siliconeMassG / 2, 9);
    expect(plan.partBG).toBeCloseTo(plan.siliconeMassG / 2, 9);
  });

  it('shares a 10 : 1 material so the parts keep the ratio and make up the mass', () => {
    const plan = moldBox(input({ ratio: { partA: 10, partB: 1 } }));
    expect(plan.partAG / plan.partBG).toBeCloseTo(10, 9);
    // mass bookkeeping checked with js-quantities
    expect(Qty(plan.partAG, 'g').add(Qty(plan.partBG, 'g')).to('kg').scalar).toBeCloseTo(Qty(plan.siliconeMassG, 'g').to('kg').scalar, 12);
  });

  it('hands its mass to the mix calculator for a weigh-out that comes back within a scale step', () => {
    const plan = moldBox(input());
    const mix = mixForRun({ ratio: { partA: 1, partB: 1 }, softener: null, pigment: null, target: { kind: 'total', totalG: plan.siliconeMassG }, scaleResolutionG: 0.1 });
    expect(Math.abs(mix.totalG - plan.siliconeMassG)).toBeLessThanOrEqual(0.1);
  });
});
