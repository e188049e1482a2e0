/**
 * Demo contents of the life-cast archive, as pure data: an invented studio store, twenty casts of
 * the six demo performers, their movements and condition checks, and drawn placeholder photos.
 * Keys, not ids: performers by ARCHIVE_DEMO_PERFORMERS key, staff by DEMO_USERS key, places and
 * casts by their own keys. Times are days before the seeding moment, so the demo never goes stale.
 */
import type { BodyRegion, CastKind, ConditionGrade } from '#shared/domain/archive-casts.ts';
import type { LocationLevel } from '#shared/domain/archive-locations.ts';
import { applyMovement, initialCastState, type CastState, type Movement, type MovementRecord } from '#shared/domain/archive-movements.ts';
import { labelCodeFromNumber, LABEL_CODE_SPACE } from '#shared/domain/label-codes.ts';

/** The demo performers of seed.ts, keyed; the seed matches them by legal name. */
export const ARCHIVE_DEMO_PERFORMERS = [
  { key: 'juno', legalName: 'Juno Castellane' },
  { key: 'oz', legalName: 'Oswin Parfitt-Reyes' },
  { key: 'halvard', legalName: 'Halvard Imre Solberg' },
  { key: 'bea', legalName: 'Beatrix Nwachukwu' },
  { key: 'tamsin', legalName: 'Tamsin Achebe-Lowry' },
  { key: 'cory', legalName: 'Corentin Malik Ashdown' },
] as const;
export type DemoPerformerKey = (typeof ARCHIVE_DEMO_PERFORMERS)[number]['key'];

/** Productions casts came from; "The Glass Orchard" is an earlier invented production the older casts date from. */
export const ARCHIVE_DEMO_PRODUCTIONS = {
  lantern: { name: 'The Lantern Keeper', kind: 'stage', startsOn: '2026-09-14', endsOn: '2027-04-30' },
  saltglass: { name: 'Saltglass Mile', kind: 'television', startsOn: '2027-01-11', endsOn: '2027-06-25' },
  orchard: { name: 'The Glass Orchard', kind: 'film', startsOn: '2021-04-05', endsOn: '2021-08-27' },
} as const;
export type DemoProductionKey = keyof typeof ARCHIVE_DEMO_PRODUCTIONS;

/**
 * Storage consents the archive demo needs besides those seed.ts already signs (Juno's and Bea's,
 * for The Lantern Keeper). A cast follows the consent given to its own production: with the
 * template's 1825-day validity, Oz's earlier one runs out within weeks and Halvard's has run out.
 */
export const ARCHIVE_DEMO_STORAGE_CONSENTS: { performerKey: DemoPerformerKey; productionKey: DemoProductionKey; signedDaysAgo: number }[] = [
  { performerKey: 'oz', productionKey: 'orchard', signedDaysAgo: 1800 },
  { performerKey: 'oz', productionKey: 'lantern', signedDaysAgo: 23 },
  { performerKey: 'halvard', productionKey: 'orchard', signedDaysAgo: 1900 },
  { performerKey: 'tamsin', productionKey: 'lantern', signedDaysAgo: 34 },
  { performerKey: 'cory', productionKey: 'lantern', signedDaysAgo: 30 },
];

export interface SeedLocation {
  key: string;
  parentKey: string | null;
  level: LocationLevel;
  code: string;
  name: string;
  environment: string | null;
}

const NORTH_ENV = '18–21 °C, RH 40–55 % with the dehumidifier on; no daylight.';
const SOUTH_ENV = '16–19 °C, RH 45–60 %; the north wall runs damp in winter, so the bottom shelves stay clear of molds.';

function rack(room: string, code: string, name: string, shelves: number, environment: string | null): SeedLocation[] {
  const key = `${room}-${code.toLowerCase()}`;
  const out: SeedLocation[] = [{ key, parentKey: room, level: 'rack', code, name, environment }];
  for (let s = 1; s <= shelves; s++) out.push({ key: `${key}-s${s}`, parentKey: key, level: 'shelf', code: String(s), name: `Shelf ${s}`, environment: null });
  return out;
}

/** Gullhaven Studio Store: a North room for molds and a South room for positives and cores. */
export const ARCHIVE_DEMO_LOCATIONS: SeedLocation[] = [
  { key: 'gh', parentKey: null, level: 'site', code: 'GH', name: 'Gullhaven Studio Store', environment: 'Detached store behind the workshop; heated October to April.' },
  { key: 'north', parentKey: 'gh', level: 'room', code: 'NORTH', name: 'North Store', environment: NORTH_ENV },
  ...rack('north', 'R1', 'Rack 1 (molds)', 3, null),
  { key: 'north-r1-s2-b1', parentKey: 'north-r1-s2', level: 'bin', code: 'B1', name: 'Bin B1 (small molds)', environment: 'Lidded crate with silica gel; change the sachets monthly.' },
  ...rack('north', 'R2', 'Rack 2 (silicone molds)', 3, 'Keep silicone molds lidded and away from the radiator.'),
  { key: 'north-r2-b2', parentKey: 'north-r2', level: 'bin', code: 'B2', name: 'Crate B2 (in the rack bay)', environment: null },
  { key: 'south', parentKey: 'gh', level: 'room', code: 'SOUTH', name: 'South Store', environment: SOUTH_ENV },
  ...rack('south', 'R1', 'Rack 1 (positives)', 3, null),
  ...rack('south', 'R2', 'Rack 2 (heads and busts)', 2, 'Deep shelves for busts; pad with foam.'),
  { key: 'south-r2-s1-b3', parentKey: 'south-r2-s1', level: 'bin', code: 'B3', name: 'Bin B3 (photography)', environment: 'Temporary holding for condition photos.' },
];

export interface SeedCast {
  key: string;
  labelCode: string;
  performerKey: DemoPerformerKey;
  productionKey: DemoProductionKey;
  region: BodyRegion;
  kind: CastKind;
  material: string;
  madeDaysAgo: number;
  /** A DEMO_USERS key. */
  madeBy: string;
  pouredFromKey: string | null;
  normalLocationKey: string;
  notes: string | null;
}

type CastRow = [key: string, performer: DemoPerformerKey, production: DemoProductionKey, region: BodyRegion, kind: CastKind, material: string, madeDaysAgo: number, madeBy: string, pouredFrom: string | null, home: string, notes: string | null];

const CAST_ROWS: CastRow[] = [
  ['juno-face-mold', 'juno', 'lantern', 'face', 'mold', 'Alginate with plaster bandage jacket', 36, 'artist', null, 'north-r1-s1', 'Eyes closed, nostrils kept open throughout.'],
  ['juno-face-positive', 'juno', 'lantern', 'face', 'positive', 'Gypsum stone', 35, 'artist', 'juno-face-mold', 'south-r1-s1', null],
  ['juno-face-core', 'juno', 'lantern', 'face', 'core', 'Fibreglass-reinforced resin', 30, 'artist2', 'juno-face-mold', 'south-r1-s2', 'Core for the Keeper’s weathered-cheek appliance.'],
  ['juno-hand-mold', 'juno', 'lantern', 'hand', 'mold', 'Silicone', 33, 'artist2', null, 'north-r2-s1', 'Right hand, fingers spread.'],
  ['juno-hand-positive', 'juno', 'lantern', 'hand', 'positive', 'Polyurethane resin', 32, 'artist2', 'juno-hand-mold', 'south-r1-s3', null],
  ['oz-head-mold', 'oz', 'lantern', 'head', 'mold', 'Silicone with plaster jacket', 22, 'artist', null, 'north-r2-s2', 'Bald cap over scalp hair.'],
  ['oz-head-positive', 'oz', 'lantern', 'head', 'positive', 'Gypsum stone', 21, 'artist', 'oz-head-mold', 'south-r2-s1', null],
  ['oz-shoulders-mold', 'oz', 'orchard', 'head_and_shoulders', 'mold', 'Alginate with plaster bandage jacket', 1795, 'artist', null, 'north-r1-s3', 'From an earlier production; kept for the Sailor’s neck piece.'],
  ['oz-shoulders-positive', 'oz', 'orchard', 'head_and_shoulders', 'positive', 'Fibreglass-reinforced resin', 1794, 'artist', 'oz-shoulders-mold', 'south-r2-s2', null],
  ['halvard-teeth-mold', 'halvard', 'orchard', 'teeth', 'mold', 'Alginate', 1890, 'artist2', null, 'north-r1-s2-b1', 'Upper arch impression.'],
  ['halvard-teeth-positive', 'halvard', 'orchard', 'teeth', 'positive', 'Gypsum stone', 1890, 'artist2', 'halvard-teeth-mold', 'north-r1-s2-b1', 'Upper arch, for the Harbourmaster’s gap-tooth veneer.'],
  ['bea-torso-mold', 'bea', 'lantern', 'torso', 'mold', 'Plaster bandage', 55, 'artist', null, 'north-r1-s2', null],
  ['bea-torso-positive', 'bea', 'lantern', 'torso', 'positive', 'Fibreglass-reinforced resin', 54, 'artist', 'bea-torso-mold', 'south-r1-s2', null],
  ['bea-arm-mold', 'bea', 'lantern', 'arm', 'mold', 'Silicone with plaster jacket', 50, 'artist2', null, 'north-r2-s3', 'Left forearm to elbow.'],
  ['tamsin-face-mold', 'tamsin', 'lantern', 'face', 'mold', 'Alginate with plaster bandage jacket', 28, 'artist', null, 'north-r1-s1', null],
  ['tamsin-face-positive', 'tamsin', 'lantern', 'face', 'positive', 'Gypsum stone', 27, 'artist', 'tamsin-face-mold', 'south-r1-s1', null],
  ['tamsin-foot-mold', 'tamsin', 'lantern', 'foot', 'mold', 'Alginate', 26, 'artist2', null, 'north-r2-b2', 'Bare left foot, standing.'],
  ['cory-head-mold', 'cory', 'lantern', 'head', 'mold', 'Silicone with plaster jacket', 24, 'artist', null, 'north-r2-s2', null],
  ['cory-head-positive', 'cory', 'lantern', 'head', 'positive', 'Gypsum stone', 23, 'artist', 'cory-head-mold', 'south-r2-s1', null],
  ['cory-leg-sculpt', 'cory', 'lantern', 'leg', 'other', 'Clay over a plaster positive', 18, 'artist2', null, 'south-r1-s3', 'Sculpt for the Lamp Ghost’s shin appliance.'],
];

/** Spreads the demo labels over the code space so they look as varied as drawn ones. */
function demoLabelNumber(i: number): number {
  return ((i + 1) * 1_234_567 + 890_123) % LABEL_CODE_SPACE;
}

export const ARCHIVE_DEMO_CASTS: SeedCast[] = CAST_ROWS.map(([key, performerKey, productionKey, region, kind, material, madeDaysAgo, madeBy, pouredFromKey, normalLocationKey, notes], i) => ({
  key,
  labelCode: labelCodeFromNumber('cast', demoLabelNumber(i)),
  performerKey,
  productionKey,
  region,
  kind,
  material,
  madeDaysAgo,
  madeBy,
  pouredFromKey,
  normalLocationKey,
  notes,
}));

/** Label codes for the places, in the same order as ARCHIVE_DEMO_LOCATIONS. */
export const ARCHIVE_DEMO_LOCATION_LABELS: Record<string, string> = Object.fromEntries(
  ARCHIVE_DEMO_LOCATIONS.map((l, i) => [l.key, labelCodeFromNumber('location', demoLabelNumber(i + 100))]),
);

const levelOf = (key: string): LocationLevel => ARCHIVE_DEMO_LOCATIONS.find((l) => l.key === key)!.level;
const place = (key: string) => ({ id: key, level: levelOf(key) });
const by = { movedBy: 'archivist', authorisedBy: 'head' };

/** A move as data: `daysAgo` before seeding, due dates `dueInDays` after it (negative = already passed). */
export interface SeedMovement {
  castKey: string;
  daysAgo: number;
  dueInDays?: number;
  move: SeedMove;
}
type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;
/** A movement without its times; mover and authoriser default to the archivist and the head. */
export type SeedMove = DistributiveOmit<Movement, 'at' | 'movedBy' | 'authorisedBy' | 'dueBackAt'> & { movedBy?: string; authorisedBy?: string };

export const ARCHIVE_DEMO_MOVEMENTS: SeedMovement[] = [
  { castKey: 'halvard-teeth-mold', daysAgo: 1880, move: { kind: 'destruction', witness: 'admin', reason: 'Alginate shrinks within days; the positive was poured and the impression discarded.' } },
  { castKey: 'juno-face-positive', daysAgo: 10, dueInDays: -7, move: { kind: 'check_out', holder: 'Rafe Lindqvist', reason: 'Sculpting the weathered-cheek appliance' } },
  { castKey: 'juno-face-positive', daysAgo: 6, move: { kind: 'check_in' } },
  { castKey: 'juno-face-positive', daysAgo: 2, dueInDays: 5, move: { kind: 'check_out', holder: 'Sol Varga', reason: 'Fitting check for the brow piece' } },
  // The overdue check-out of the demo.
  { castKey: 'oz-head-positive', daysAgo: 12, dueInDays: -4, move: { kind: 'check_out', holder: 'Rafe Lindqvist', reason: 'Sculpting the Drowned Sailor’s bald cap and brow' } },
  { castKey: 'bea-torso-positive', daysAgo: 20, dueInDays: 40, move: { kind: 'loan', production: 'Saltglass Mile', contact: 'Sol Varga', reason: 'Body-double fitting' } },
  { castKey: 'cory-head-positive', daysAgo: 15, move: { kind: 'relocation', to: place('south-r1-s3'), alsoNormal: true, reason: 'Off the deep shelf after a damp reading' } },
  { castKey: 'tamsin-face-mold', daysAgo: 3, move: { kind: 'relocation', to: place('south-r2-s1-b3'), reason: 'Held for condition photos' } },
  { castKey: 'oz-shoulders-positive', daysAgo: 400, move: { kind: 'relocation', to: place('south-r1-s1'), authorisedBy: 'archivist', reason: 'Rack 2 rebuilt' } },
  { castKey: 'oz-shoulders-positive', daysAgo: 380, move: { kind: 'relocation', to: place('south-r2-s2'), authorisedBy: 'archivist', reason: 'Back after the rebuild' } },
];

export const ARCHIVE_DEMO_CONDITION_CHECKS: { castKey: string; daysAgo: number; checkedBy: string; grade: ConditionGrade; notes: string | null }[] = [
  { castKey: 'juno-face-mold', daysAgo: 35, checkedBy: 'archivist', grade: 'good', notes: null },
  { castKey: 'bea-torso-mold', daysAgo: 50, checkedBy: 'archivist', grade: 'good', notes: null },
  { castKey: 'oz-shoulders-positive', daysAgo: 380, checkedBy: 'archivist', grade: 'good', notes: 'Checked after the rack rebuild.' },
  { castKey: 'oz-shoulders-positive', daysAgo: 20, checkedBy: 'archivist', grade: 'fair', notes: 'Hairline crack along the neck edge; not spreading.' },
  { castKey: 'halvard-teeth-positive', daysAgo: 60, checkedBy: 'archivist', grade: 'poor', notes: 'Chipped incisor edge; powdering where handled.' },
  { castKey: 'oz-head-mold', daysAgo: 21, checkedBy: 'artist', grade: 'good', notes: null },
];

export interface DemoCastPlan {
  cast: SeedCast;
  madeOn: Date;
  state: CastState;
  records: MovementRecord[];
}

/**
 * Dates the demo for a seeding moment and plays every move through the archive's own rules, so
 * the seed can store the resulting states and history; a move the rules refuse throws.
 */
export function buildArchiveDemo(now: Date): DemoCastPlan[] {
  const day = 86_400_000;
  const ago = (days: number) => new Date(now.getTime() - days * day);
  return ARCHIVE_DEMO_CASTS.map((cast) => {
    const madeOn = ago(cast.madeDaysAgo);
    const start = initialCastState(place(cast.normalLocationKey), madeOn);
    if (!start.ok) throw new Error(`demo cast ${cast.key}: ${JSON.stringify(start.errors)}`);
    let state = start.state;
    const records: MovementRecord[] = [];
    const moves = ARCHIVE_DEMO_MOVEMENTS.filter((m) => m.castKey === cast.key).sort((a, b) => b.daysAgo - a.daysAgo);
    for (const m of moves) {
      const at = ago(m.daysAgo);
      const dueBackAt = m.dueInDays === undefined ? null : new Date(now.getTime() + m.dueInDays * day);
      const movement = { ...by, ...m.move, at, dueBackAt } as Movement;
      // Old check-outs are replayed against their own time, so a due date now passed is not refused.
      const out = applyMovement(state, movement, at);
      if (!out.ok) throw new Error(`demo move for ${cast.key}: ${JSON.stringify(out.errors)}`);
      state = out.state;
      records.push(out.record);
    }
    return { cast, madeOn, state, records };
  });
}

const KIND_TONES: Record<CastKind, [string, string]> = {
  mold: ['#a9b8ac', '#7e9183'],
  positive: ['#ece5d6', '#c9bfae'],
  core: ['#bdb3a6', '#958b7f'],
  other: ['#c08e72', '#98694f'],
};

const SHAPES: Record<BodyRegion, string> = {
  face: 'M320 120 C 395 120 420 185 414 250 C 408 320 372 372 320 372 C 268 372 232 320 226 250 C 220 185 245 120 320 120 Z M276 222 q 18 -10 36 0 q -18 8 -36 0 Z M328 222 q 18 -10 36 0 q -18 8 -36 0 Z M320 236 l -10 56 q 10 8 20 0 Z',
  head: 'M320 92 C 392 92 426 150 422 222 C 418 290 380 336 352 344 L 352 382 L 288 382 L 288 344 C 260 336 222 290 218 222 C 214 150 248 92 320 92 Z',
  head_and_shoulders: 'M320 84 C 378 84 404 130 400 190 C 396 246 368 280 348 288 L 348 312 C 420 322 492 348 516 396 L 124 396 C 148 348 220 322 292 312 L 292 288 C 272 280 244 246 240 190 C 236 130 262 84 320 84 Z',
  torso: 'M246 96 C 280 110 360 110 394 96 C 452 120 476 170 470 236 C 462 300 430 350 420 396 L 220 396 C 210 350 178 300 170 236 C 164 170 188 120 246 96 Z',
  arm: 'M120 236 C 200 214 330 208 430 222 C 470 226 510 232 530 250 C 510 268 470 272 430 276 C 330 290 200 286 120 266 Z',
  hand: 'M262 392 L 262 262 C 262 250 270 246 276 246 L 276 150 C 276 136 296 136 296 150 L 298 240 L 304 128 C 304 112 326 112 326 128 L 326 238 L 334 136 C 334 120 356 120 356 136 L 354 246 L 362 164 C 362 150 382 150 382 164 L 378 290 L 414 246 C 424 234 442 246 432 260 L 384 348 L 380 392 Z',
  leg: 'M290 84 C 330 80 360 84 364 100 C 372 190 356 262 352 330 C 350 352 356 366 388 380 C 404 388 396 402 380 402 L 296 402 C 286 380 292 350 292 320 C 290 250 272 170 290 84 Z',
  foot: 'M196 330 C 196 290 214 230 240 214 C 262 202 282 214 290 240 C 300 276 350 300 420 312 C 470 320 486 346 470 366 C 456 384 300 386 220 378 C 204 376 196 356 196 330 Z',
  teeth: 'M200 300 C 200 180 252 128 320 128 C 388 128 440 180 440 300 L 404 300 C 404 204 370 166 320 166 C 270 166 236 204 236 300 Z',
  other: 'M230 180 C 270 110 380 110 420 170 C 460 230 440 330 380 370 C 320 410 230 390 206 320 C 190 270 200 230 230 180 Z',
};

/** How far each silhouette drops so it rests on the shelf line rather than floating. */
const SHAPE_DROP: Partial<Record<BodyRegion, number>> = { face: 20, arm: 120, teeth: 92, other: 4 };

/**
 * A drawn stand-in for a cast photo, as an SVG string: a muted backdrop and shelf, the region's
 * silhouette in the kind's material tone, and a soft shadow. `variant` shifts the backdrop so a
 * page of thumbnails does not look like one image repeated.
 */
export function placeholderPhotoSvg(opts: { region: BodyRegion; kind: CastKind; variant?: number; width?: number; height?: number }): string {
  const { region, kind, variant = 0, width = 640, height = 480 } = opts;
  const [light, dark] = KIND_TONES[kind];
  const hue = 28 + ((variant * 37) % 40);
  const wall = `hsl(${hue}, 14%, ${78 - (variant % 3) * 4}%)`;
  const shelf = `hsl(${hue}, 18%, ${58 - (variant % 2) * 5}%)`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 640 480">`,
    '<defs>',
    `<linearGradient id="wall" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="${wall}"/><stop offset="1" stop-color="hsl(${hue}, 12%, 66%)"/></linearGradient>`,
    `<radialGradient id="body" cx="0.38" cy="0.3" r="0.8"><stop offset="0" stop-color="${light}"/><stop offset="1" stop-color="${dark}"/></radialGradient>`,
    '<filter id="soft" x="-20%" y="-20%" width="140%" height="140%"><feGaussianBlur stdDeviation="10"/></filter>',
    '</defs>',
    '<rect width="640" height="480" fill="url(#wall)"/>',
    `<rect y="392" width="640" height="88" fill="${shelf}"/>`,
    '<rect y="392" width="640" height="6" fill="#000" opacity="0.12"/>',
    '<ellipse cx="330" cy="404" rx="190" ry="16" fill="#000" opacity="0.28" filter="url(#soft)"/>',
    `<path transform="translate(0 ${SHAPE_DROP[region] ?? 0})" d="${SHAPES[region]}" fill="url(#body)" fill-rule="evenodd" stroke="${dark}" stroke-width="2" stroke-linejoin="round"/>`,
    '</svg>',
  ].join('');
}
