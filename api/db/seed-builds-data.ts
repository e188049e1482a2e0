/*
 * The demo appliance builds: runs of silicone pieces poured from the demo molds of The Lantern Keeper,
 * each material a demo catalogue product and lot. Keys, not ids: molds by their archive key, products
 * by name, lots by code, staff by DEMO_USERS key. Dates are days before the seeding moment.
 * Juno Castellane's face pieces fall short of the shoot days planned; the Sailor's head pieces cover theirs.
 */
import type { BuildMaterialRole } from '#shared/domain/builds.ts';
import type { SparesRule } from '#shared/domain/pieces.ts';
import type { CoatingInput, MixInput } from '#shared/schemas/appliance-calc.ts';

export interface SeedBuild {
  key: string;
  /** ARCHIVE_DEMO_CASTS key of the mold. */
  moldKey: string;
  madeDaysAgo: number;
  /** DEMO_USERS key of the maker. */
  madeBy: string;
  materials: { role: BuildMaterialRole; product: string; lot: string }[];
  mix: MixInput;
  weighed: { partA: number | null; softener: number | null; pigment: number | null; partB: number | null };
  coating: CoatingInput | null;
  cureMinutes: number;
  piecesMade: number;
  used: number;
  spoiled: number;
  notes: string | null;
}

const SILICONE = 'Slipway platinum silicone base';
const SOFTENER = 'Slack Tide silicone softener';

export const SEED_BUILDS: SeedBuild[] = [
  {
    key: 'juno-cheek-run',
    moldKey: 'juno-face-mold',
    madeDaysAgo: 20,
    madeBy: 'artist',
    materials: [
      { role: 'part_a', product: SILICONE, lot: 'SP-2606' },
      { role: 'part_b', product: SILICONE, lot: 'SP-2606' },
      { role: 'softener', product: SOFTENER, lot: 'ST-2605' },
      { role: 'pigment', product: 'Kelpwrack flesh-red silicone pigment', lot: 'KW-2604' },
      { role: 'flocking', product: 'Sea-fret rayon flocking', lot: 'SF-2602' },
      { role: 'cap_material', product: 'Lighthouse vinyl cap plastic', lot: 'LC-2604' },
      { role: 'solvent', product: 'Mooring acetone', lot: 'MA-2603' },
      { role: 'release_agent', product: 'Wharfside mold release', lot: 'WR-2602' },
    ],
    mix: {
      ratio: { partA: 1, partB: 1 },
      softener: { percent: 20, makerMaxPercent: 100 },
      pigment: { kind: 'percent', percent: 2 },
      target: { kind: 'total', totalG: 250 },
      scaleResolutionG: 0.1,
    },
    weighed: { partA: 102.9, softener: 41.1, pigment: 4.1, partB: 102.8 },
    coating: { capParts: 1, solventParts: 8, targetMl: 90 },
    cureMinutes: 30,
    piecesMade: 8,
    used: 3,
    spoiled: 1,
    notes: 'Weathered-cheek appliance for the Keeper. Two coats of cap, brushed.',
  },
  {
    key: 'oz-scalp-run',
    moldKey: 'oz-head-mold',
    madeDaysAgo: 12,
    madeBy: 'artist2',
    materials: [
      { role: 'part_a', product: SILICONE, lot: 'SP-2611' },
      { role: 'part_b', product: SILICONE, lot: 'SP-2611' },
      { role: 'softener', product: SOFTENER, lot: 'ST-2605' },
      { role: 'pigment', product: 'Kelpwrack flesh-red silicone pigment', lot: 'KW-2604' },
      { role: 'release_agent', product: 'Wharfside mold release', lot: 'WR-2602' },
    ],
    mix: {
      ratio: { partA: 1, partB: 1 },
      softener: { percent: 10, makerMaxPercent: 100 },
      pigment: { kind: 'drops', drops: 12, dropMassG: 0.03 },
      target: { kind: 'partA', partAG: 150 },
      scaleResolutionG: 0.1,
    },
    weighed: { partA: 150, softener: 30, pigment: 0.4, partB: 150.1 },
    coating: null,
    cureMinutes: 45,
    piecesMade: 10,
    used: 2,
    spoiled: 0,
    notes: 'Drowned Sailor’s scalp and brow piece; the data sheet gives 45 minutes at the workshop’s temperature.',
  },
  {
    key: 'juno-hand-run',
    moldKey: 'juno-hand-mold',
    madeDaysAgo: 5,
    madeBy: 'artist',
    materials: [
      { role: 'part_a', product: SILICONE, lot: 'SP-2611' },
      { role: 'part_b', product: SILICONE, lot: 'SP-2611' },
    ],
    mix: { ratio: { partA: 1, partB: 1 }, softener: null, pigment: null, target: { kind: 'total', totalG: 120 }, scaleResolutionG: 0.1 },
    weighed: { partA: 60, softener: null, pigment: null, partB: 60 },
    coating: null,
    cureMinutes: 30,
    piecesMade: 6,
    used: 0,
    spoiled: 0,
    notes: null,
  },
];

/** Shoot days still to come for the demo appliances: Juno's face pieces are short, the Sailor's head pieces are not. */
export const SEED_PLANS: { moldKey: string; shootDaysPlanned: number; spares: SparesRule; piecesPerDay: number }[] = [
  { moldKey: 'juno-face-mold', shootDaysPlanned: 10, spares: { kind: 'total', spares: 2 }, piecesPerDay: 1 },
  { moldKey: 'oz-head-mold', shootDaysPlanned: 5, spares: { kind: 'total', spares: 2 }, piecesPerDay: 1 },
];
