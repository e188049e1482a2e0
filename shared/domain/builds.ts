import type { MixInput, MixRatio } from './mix.ts';
import { piecesRemaining, type PiecesTally } from './pieces.ts';

/*
 * Appliance builds: a run of pieces poured from a performer's mold. Everything in a piece touches the
 * performer's skin, so each material is recorded with its lot, and the pieces are counted one by one.
 */

/** What a material does in a build; parts A and B are the two halves of the appliance silicone. */
export const BUILD_MATERIAL_ROLES = ['part_a', 'part_b', 'softener', 'pigment', 'flocking', 'cap_material', 'solvent', 'release_agent'] as const;
/** One of BUILD_MATERIAL_ROLES. */
export type BuildMaterialRole = (typeof BUILD_MATERIAL_ROLES)[number];

/** Material roles in plain words. */
export const BUILD_MATERIAL_ROLE_LABELS: Record<BuildMaterialRole, string> = {
  part_a: 'Part A',
  part_b: 'Part B',
  softener: 'Softener',
  pigment: 'Pigment',
  flocking: 'Flocking',
  cap_material: 'Cap material',
  solvent: 'Solvent',
  release_agent: 'Release agent',
};

/** Where a piece is: still on the shelf, worn on a performer, or spoiled (torn, bubbled, lost). */
export const PIECE_STATUSES = ['on_hand', 'used', 'spoiled'] as const;
/** One of PIECE_STATUSES. */
export type PieceStatus = (typeof PIECE_STATUSES)[number];

/** Piece statuses in plain words; the screen shows them with an icon as well. */
export const PIECE_STATUS_LABELS: Record<PieceStatus, string> = {
  on_hand: 'On the shelf',
  used: 'Used',
  spoiled: 'Spoiled',
};

/** A build's tally read from its pieces: each piece is made once and then used, spoiled or still on the shelf. */
export function tallyOfPieces(pieces: readonly { status: PieceStatus }[]): PiecesTally & { remaining: number } {
  const tally = {
    made: pieces.length,
    used: pieces.filter((p) => p.status === 'used').length,
    spoiled: pieces.filter((p) => p.status === 'spoiled').length,
  };
  return { ...tally, remaining: piecesRemaining(tally) };
}

/** A build's count of pieces made may fall only as far as the pieces already used or spoiled, which stay on record. */
export function piecesMadeRefusal(made: number, tally: PiecesTally): string | null {
  const gone = tally.used + tally.spoiled;
  if (made >= gone) return null;
  return `${gone} ${gone === 1 ? 'piece is' : 'pieces are'} used or spoiled already, so at least ${gone} ${gone === 1 ? 'was' : 'were'} made`;
}

/** A material as a build names it: its role and the catalogue product it is. */
export interface BuildMaterialRef {
  role: BuildMaterialRole;
  productId: string;
  lotId: string;
}

/** What the batch and coating contain, so each needs its material named. */
export interface BuildContents {
  mix: Pick<MixInput, 'softener' | 'pigment'>;
  coating: { solventParts: number } | null;
}

type FieldErrors = Record<string, string[]>;

function add(out: FieldErrors, key: string, message: string): void {
  (out[key] ??= []).push(message);
}

/**
 * The materials a build must name: one part A and one part B of the same material (the ratio is that
 * material's), at most one softener, the softener and pigment the batch is dosed with, and the cap
 * material and solvent of its coating; a lot is named once per role. Keys are field paths.
 */
export function buildMaterialProblems(materials: readonly BuildMaterialRef[], contents: BuildContents): FieldErrors {
  const out: FieldErrors = {};
  const indexes = (role: BuildMaterialRole) => materials.flatMap((m, i) => (m.role === role ? [i] : []));
  const partA = indexes('part_a');
  const partB = indexes('part_b');
  if (partA.length === 0) add(out, 'materials', 'Name the part A of the silicone and its lot');
  if (partB.length === 0) add(out, 'materials', 'Name the part B of the silicone and its lot');
  for (const i of partA.slice(1)) add(out, `materials.${i}.role`, 'A batch has one part A: list the other material under its own role');
  for (const i of partB.slice(1)) add(out, `materials.${i}.role`, 'A batch has one part B: list the other material under its own role');
  const a = partA[0] === undefined ? undefined : materials[partA[0]];
  for (const i of partB.slice(0, 1)) {
    if (a && materials[i]!.productId !== a.productId) add(out, `materials.${i}.productId`, 'Part B must be of the same material as part A');
  }
  const softeners = indexes('softener');
  for (const i of softeners.slice(1)) add(out, `materials.${i}.role`, 'A batch takes one softener');
  if ((contents.mix.softener?.percent ?? 0) > 0 && softeners.length === 0) add(out, 'materials', 'The batch has softener in it: name the softener and its lot');
  const pigment = contents.mix.pigment;
  const pigmented = pigment !== null && (pigment.kind === 'percent' ? pigment.percent > 0 : pigment.drops > 0);
  if (pigmented && indexes('pigment').length === 0) add(out, 'materials', 'The batch has pigment in it: name the pigment and its lot');
  if (contents.coating && indexes('cap_material').length === 0) add(out, 'materials', 'The coating needs its cap material and lot');
  if (contents.coating && contents.coating.solventParts > 0 && indexes('solvent').length === 0) add(out, 'materials', 'The coating is thinned: name the solvent and its lot');
  const seen = new Map<string, number>();
  materials.forEach((m, i) => {
    const key = `${m.role} ${m.lotId}`;
    if (seen.has(key)) add(out, `materials.${i}.lotId`, `This lot is already listed as ${BUILD_MATERIAL_ROLE_LABELS[m.role].toLowerCase()}`);
    else seen.set(key, i);
  });
  return out;
}

/** The figures a catalogue product records for a mixed material; null where the record has none. */
export interface MaterialFigures {
  name: string;
  mixRatio: MixRatio | null;
  makerMaxSoftenerPercent: number | null;
}

/** Two ratios name the same proportion (1 : 1 is 100 : 100), within rounding of the typed figures. */
export function sameRatio(a: MixRatio, b: MixRatio): boolean {
  return Math.abs(a.partA * b.partB - a.partB * b.partA) <= 1e-9 * Math.max(1, a.partA * b.partB, a.partB * b.partA);
}

/**
 * Where the catalogue records the silicone's ratio or its maker's maximum softener, a build uses those
 * figures: a different ratio or maximum is refused, naming the catalogue's. Keys are field paths.
 */
export function materialFigureProblems(product: MaterialFigures, mix: Pick<MixInput, 'ratio' | 'softener'>): FieldErrors {
  const out: FieldErrors = {};
  if (product.mixRatio && !sameRatio(product.mixRatio, mix.ratio)) {
    add(out, 'mix.ratio.partA', `The catalogue gives ${product.name} a ratio of ${product.mixRatio.partA} : ${product.mixRatio.partB}`);
  }
  if (product.makerMaxSoftenerPercent !== null && mix.softener && mix.softener.makerMaxPercent !== product.makerMaxSoftenerPercent) {
    add(out, 'mix.softener.makerMaxPercent', `The catalogue gives ${product.makerMaxSoftenerPercent} % as the maker’s maximum for ${product.name}`);
  }
  return out;
}

/** The cautions shown at the calculators and at every build screen, in Plinth's words. */
export const BUILD_CAUTIONS = {
  title: 'Silicones, coatings and solvents',
  items: [
    'Spray or brush solvent-borne coatings only with good ventilation, and wear a respirator suited to the solvent whenever you spray.',
    'Keep open flames, sparks and heaters away from solvents and their vapour.',
    'Wear gloves to mix and handle uncured silicone, softener, pigment and coatings.',
    'The material’s safety data sheet and its maker’s instructions come before any rule of thumb or figure worked out here.',
  ],
} as const;

/**
 * A build is recorded once its pieces are poured, so its date has begun somewhere: the day's start in
 * UTC may be at most fourteen hours ahead of now (UTC+14 is the first zone to reach a date).
 */
export function buildDateRefusal(madeOn: string, now: Date): string | null {
  const start = Date.parse(`${madeOn}T00:00:00Z`);
  return start > now.getTime() + 14 * 3_600_000 ? 'A build cannot be dated in the future' : null;
}

/** The moment a lot is checked at for a build: the start of the build's day, so a lot in date that day is accepted. */
export function buildLotCheckMoment(madeOn: string): Date {
  return new Date(`${madeOn}T00:00:00Z`);
}
