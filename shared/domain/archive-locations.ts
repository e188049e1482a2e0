/**
 * The archive's storage places as a tree: site › room › rack › shelf › bin.
 * Every cast sits at exactly one of these (or is out with a person), so the tree has to stay a tree.
 */
import type { FieldErrors } from '../errors.ts';

/** The levels of the storage tree, from the top down. */
export const LOCATION_LEVELS = ['site', 'room', 'rack', 'shelf', 'bin'] as const;
/** One of the location levels. */
export type LocationLevel = (typeof LOCATION_LEVELS)[number];

/** Location levels in the product's words. */
export const LOCATION_LEVEL_LABELS: Record<LocationLevel, string> = {
  site: 'Site',
  room: 'Room',
  rack: 'Rack',
  shelf: 'Shelf',
  bin: 'Bin',
};

/**
 * Which level each level may hang under; `null` stands for the top of the tree.
 * A bin may sit on a shelf or straight in a rack (a crate slotted into a rack bay), nothing lower holds a shelf.
 */
export const ALLOWED_PARENT_LEVELS: Record<LocationLevel, readonly (LocationLevel | null)[]> = {
  site: [null],
  room: ['site'],
  rack: ['room'],
  shelf: ['rack'],
  bin: ['shelf', 'rack'],
};

/** Casts are placed only where a hand can find them: on a shelf or in a bin, never "somewhere in room 2". */
export const STORAGE_LEVELS: readonly LocationLevel[] = ['shelf', 'bin'];

/** A storage place: its level, its parent, its short code and its environment notes. */
export interface LocationNode {
  id: string;
  parentId: string | null;
  level: LocationLevel;
  /** Short code printed on the label and used in code paths, e.g. "R2". */
  code: string;
  name: string;
  /** Temperature / relative-humidity notes, kept per place so a move can be judged against them. */
  environment?: string | null;
}

/** Places as a list or keyed by id; every helper below takes either. */
export type LocationSet = Iterable<LocationNode> | ReadonlyMap<string, LocationNode>;

function nodesOf(nodes: LocationSet): LocationNode[] {
  return nodes instanceof Map ? [...(nodes as ReadonlyMap<string, LocationNode>).values()] : [...(nodes as Iterable<LocationNode>)];
}

function indexById(nodes: LocationSet): ReadonlyMap<string, LocationNode> {
  return nodes instanceof Map ? (nodes as ReadonlyMap<string, LocationNode>) : new Map(nodesOf(nodes).map((n) => [n.id, n]));
}

/** Whether a level may hang under a parent of the given level (`null` = top of the tree). */
export function canHaveParent(level: LocationLevel, parentLevel: LocationLevel | null): boolean {
  return ALLOWED_PARENT_LEVELS[level].includes(parentLevel);
}

/** The words shown when a place is put under the wrong kind of parent; null when allowed. */
export function parentLevelRefusal(level: LocationLevel, parentLevel: LocationLevel | null): string | null {
  if (canHaveParent(level, parentLevel)) return null;
  const allowed = ALLOWED_PARENT_LEVELS[level];
  const what = LOCATION_LEVEL_LABELS[level];
  if (allowed.includes(null) && allowed.length === 1) return `A ${what.toLowerCase()} is the top of the tree and cannot sit inside another place.`;
  const names = allowed.filter((l): l is LocationLevel => l !== null).map((l) => LOCATION_LEVEL_LABELS[l].toLowerCase());
  return `A ${what.toLowerCase()} goes inside a ${names.join(' or a ')}.`;
}

/** Casts may only be placed at storage levels, so "where is it" always has a precise answer. */
export function isStorageLevel(level: LocationLevel): boolean {
  return STORAGE_LEVELS.includes(level);
}

/** The words shown when a cast is put somewhere too coarse to find it again; null when allowed. */
export function castPlacementRefusal(level: LocationLevel): string | null {
  if (isStorageLevel(level)) return null;
  return `Casts go on a shelf or in a bin, not straight into a ${LOCATION_LEVEL_LABELS[level].toLowerCase()}: choose the exact place.`;
}

/** Each place's parent id, as a map or a lookup function. */
export type ParentLookup = ReadonlyMap<string, string | null> | ((id: string) => string | null | undefined);

function lookup(parentOf: ParentLookup, id: string): string | null | undefined {
  return typeof parentOf === 'function' ? parentOf(id) : parentOf.get(id);
}

/**
 * Re-parenting a place under itself or under one of its own descendants would cut that branch off the tree.
 * Walks up from the new parent; a loop already in the data counts as a cycle rather than hanging.
 */
export function wouldCreateCycle(nodeId: string, newParentId: string | null, parentOf: ParentLookup): boolean {
  const seen = new Set<string>();
  let at: string | null | undefined = newParentId;
  while (at != null) {
    if (at === nodeId || seen.has(at)) return true;
    seen.add(at);
    at = lookup(parentOf, at);
  }
  return false;
}

/** Short codes: capitals and digits, a hyphen allowed inside, 1–10 characters; "/" is kept for code paths. */
export const LOCATION_CODE_PATTERN = /^[A-Z0-9](?:[A-Z0-9-]{0,8}[A-Z0-9])?$/;

/** Codes are typed on a tablet: compare them upper-cased and without stray spaces. */
export function normaliseLocationCode(input: string): string {
  return input.trim().replace(/\s+/g, '').toUpperCase();
}

/** The words shown for a badly formed short code; null when the (normalised) code is fine. */
export function locationCodeRefusal(code: string): string | null {
  if (code.length === 0) return 'Give the place a short code, for example R2 or B4.';
  if (code.length > 10) return 'Keep the short code to 10 characters or fewer.';
  if (!LOCATION_CODE_PATTERN.test(code)) return 'Use capital letters, digits and inner hyphens only, for example R2, A or NORTH-1.';
  return null;
}

/** Codes are unique among siblings, so a full code path names exactly one place. */
export function siblingCodeClash(
  code: string,
  parentId: string | null,
  nodes: LocationSet,
  ignoreId?: string,
): LocationNode | null {
  const wanted = normaliseLocationCode(code);
  for (const n of nodesOf(nodes)) {
    if (n.parentId === parentId && n.id !== ignoreId && normaliseLocationCode(n.code) === wanted) return n;
  }
  return null;
}

/** The chain from the top of the tree down to the place itself, for breadcrumbs and code paths. */
export function locationPath(id: string, nodes: LocationSet): LocationNode[] {
  const byId = indexById(nodes);
  const out: LocationNode[] = [];
  const seen = new Set<string>();
  let at = byId.get(id);
  while (at && !seen.has(at.id)) {
    seen.add(at.id);
    out.unshift(at);
    at = at.parentId == null ? undefined : byId.get(at.parentId);
  }
  return out;
}

/** The full code path printed under a label and typed into search, e.g. "NORTH/R2/A/3/B4". */
export function fullCodePath(id: string, nodes: LocationSet): string {
  return locationPath(id, nodes)
    .map((n) => n.code)
    .join('/');
}

/** The breadcrumb read out to a person: names from the site down, e.g. "Harbour Store › North Room › Rack 2". */
export function breadcrumb(id: string, nodes: LocationSet, separator = ' › '): string {
  return locationPath(id, nodes)
    .map((n) => n.name)
    .join(separator);
}

/** Finds the place a code path names, walking from the top; null when any step is missing. */
export function resolveCodePath(path: string, nodes: LocationSet): LocationNode | null {
  const steps = path
    .split('/')
    .map(normaliseLocationCode)
    .filter((s) => s.length > 0);
  if (steps.length === 0) return null;
  const all = nodesOf(nodes);
  let parentId: string | null = null;
  let hit: LocationNode | null = null;
  for (const step of steps) {
    hit = all.find((n) => n.parentId === parentId && normaliseLocationCode(n.code) === step) ?? null;
    if (!hit) return null;
    parentId = hit.id;
  }
  return hit;
}

/** Every place below this one (not the place itself), so a room's search finds the casts on its shelves. */
export function descendantIds(id: string, nodes: LocationSet): Set<string> {
  const children = new Map<string, string[]>();
  for (const n of nodesOf(nodes)) {
    if (n.parentId != null) (children.get(n.parentId) ?? children.set(n.parentId, []).get(n.parentId)!).push(n.id);
  }
  const out = new Set<string>();
  const stack = [...(children.get(id) ?? [])];
  while (stack.length > 0) {
    const next = stack.pop()!;
    if (out.has(next) || next === id) continue;
    out.add(next);
    stack.push(...(children.get(next) ?? []));
  }
  return out;
}

/**
 * Checks a move of a place within the tree: its level must suit the new parent, and the tree must
 * stay a tree. Errors are keyed by the form field they belong to.
 */
export function reparentRefusal(
  node: Pick<LocationNode, 'id' | 'level'>,
  newParent: Pick<LocationNode, 'id' | 'level'> | null,
  parentOf: ParentLookup,
): FieldErrors | null {
  const levelMessage = parentLevelRefusal(node.level, newParent?.level ?? null);
  if (levelMessage) return { parentId: [levelMessage] };
  if (newParent && wouldCreateCycle(node.id, newParent.id, parentOf)) {
    return { parentId: ['A place cannot go inside itself or inside one of the places it holds.'] };
  }
  return null;
}

/** What is inside a place, which decides whether it may be removed. */
export interface LocationContents {
  /** Places directly inside this one. */
  childCount: number;
  /** Casts whose current location is this place. */
  castsHere: number;
  /** Casts that call this place home (normal location), even while they are out. */
  castsHomedHere: number;
}

/**
 * A place can be removed only when empty: no places inside it, no cast in it, and no cast that
 * would come back to it, or that cast's home would silently vanish.
 */
export function locationDeletionRefusal(contents: LocationContents): string | null {
  if (contents.childCount > 0) return `This place still holds ${plural(contents.childCount, 'place')}; move or remove them first.`;
  if (contents.castsHere > 0) return `This place still holds ${plural(contents.castsHere, 'cast')}; move them first.`;
  if (contents.castsHomedHere > 0) {
    return `${plural(contents.castsHomedHere, 'cast')} ${contents.castsHomedHere === 1 ? 'has' : 'have'} this place as ${contents.castsHomedHere === 1 ? 'its' : 'their'} normal location; give ${contents.castsHomedHere === 1 ? 'it' : 'them'} a new home first.`;
  }
  return null;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}
