/**
 * The ingredient vocabulary: ingredients keyed by INCI name with synonyms and CAS number, grouped by the
 * allergen family they belong to, and marked trivial when they are carriers that never make two products
 * "share" an allergen.
 */

export const ALLERGEN_GROUPS = [
  'acrylates',
  'rosin',
  'latex',
  'rubber_accelerators',
  'fragrance',
  'preservatives',
  'solvents',
  'silicones',
  'pigments',
  'other',
] as const;
/** The allergen family an ingredient belongs to; a declared allergy may name a whole family. */
export type AllergenGroup = (typeof ALLERGEN_GROUPS)[number];

/** Allergen groups in plain words. */
export const ALLERGEN_GROUP_LABELS: Record<AllergenGroup, string> = {
  acrylates: 'Acrylates',
  rosin: 'Rosin (colophony)',
  latex: 'Natural rubber latex',
  rubber_accelerators: 'Rubber accelerators',
  fragrance: 'Fragrance',
  preservatives: 'Preservatives',
  solvents: 'Solvents',
  silicones: 'Silicones',
  pigments: 'Pigments and colourants',
  other: 'Other',
};

/** One vocabulary entry, keyed by INCI name with synonyms and CAS number. */
export interface Ingredient {
  /** The INCI name as it is written on a label, e.g. "Colophonium". */
  inci: string;
  synonyms: readonly string[];
  /** CAS Registry Number when known with confidence; null rather than a guess. */
  cas: string | null;
  group: AllergenGroup;
  /** A carrier such as water: never counts as an ingredient two products share. */
  trivial: boolean;
}

/**
 * The matching key of an INCI name: case, accents, spacing and punctuation do not matter ("C.I. 77491",
 * "CI77491" and "ci 77491" are one name), and a "(nano)" marker names the same substance.
 */
export function normaliseInciName(name: string): string {
  return name
    .normalize('NFKD')
    .replace(/\p{M}/gu, '')
    .toLowerCase()
    .replace(/\(\s*nano\s*\)/g, '')
    .replace(/[^a-z0-9]/g, '');
}

const CAS_FORM = /^(\d{2,7})-(\d{2})-(\d)$/;

/** A CAS Registry Number is well formed when its last digit equals the weighted digit sum mod 10. */
export function isValidCas(cas: string): boolean {
  const m = CAS_FORM.exec(cas.trim());
  if (!m) return false;
  const digits = (m[1]! + m[2]!).split('').toReversed();
  const sum = digits.reduce((acc, d, i) => acc + Number(d) * (i + 1), 0);
  return sum % 10 === Number(m[3]);
}

/** The vocabulary indexed for lookup by any of its names or CAS numbers. */
export interface IngredientVocabulary {
  readonly byKey: ReadonlyMap<string, Ingredient>;
  readonly byCas: ReadonlyMap<string, Ingredient>;
  /** Names claimed by more than one ingredient; the first listed keeps the name. */
  readonly conflicts: readonly { key: string; claimedBy: readonly string[] }[];
}

/** Indexes the vocabulary once by every INCI name, synonym and CAS number, so resolving a name is a lookup. */
export function buildVocabulary(ingredients: readonly Ingredient[]): IngredientVocabulary {
  const byKey = new Map<string, Ingredient>();
  const byCas = new Map<string, Ingredient>();
  const conflicts = new Map<string, Set<string>>();
  for (const ing of ingredients) {
    for (const name of [ing.inci, ...ing.synonyms]) {
      const key = normaliseInciName(name);
      if (!key) continue;
      const holder = byKey.get(key);
      if (!holder) byKey.set(key, ing);
      else if (holder !== ing) (conflicts.get(key) ?? conflicts.set(key, new Set([holder.inci])).get(key)!).add(ing.inci);
    }
    if (ing.cas && !byCas.has(ing.cas.trim())) byCas.set(ing.cas.trim(), ing);
  }
  return { byKey, byCas, conflicts: [...conflicts].map(([key, names]) => ({ key, claimedBy: [...names] })) };
}

function candidates(name: string): string[] {
  const out = [name];
  const outside = name.replace(/\([^)]*\)/g, ' ').trim();
  if (outside && outside !== name) out.push(outside);
  for (const m of name.matchAll(/\(([^)]*)\)/g)) out.push(m[1]!);
  // "Aqua/Water" names one ingredient twice; a copolymer's slash joins monomers and must not resolve to one.
  if (name.includes('/') && !/polymer/i.test(name)) out.push(...name.split('/'));
  return out;
}

/**
 * Every matching key a label name may be found under (`resolveIngredient` tries them in this order),
 * so a store can fetch just the entries a list can match instead of the whole vocabulary.
 */
export function candidateKeys(name: string): string[] {
  return [...new Set(candidates(name).map(normaliseInciName).filter((k) => k.length > 0))];
}

/**
 * The vocabulary entry a label name stands for: its INCI name or any synonym, else the name outside or
 * inside brackets ("Parfum (Fragrance)"), else one of its slash-joined parts ("Aqua/Water"), else a CAS number.
 */
export function resolveIngredient(name: string, vocabulary: IngredientVocabulary): Ingredient | null {
  for (const c of candidates(name)) {
    const hit = vocabulary.byKey.get(normaliseInciName(c));
    if (hit) return hit;
  }
  return vocabulary.byCas.get(name.trim()) ?? null;
}

/** One ingredient of a product as clearance sees it: resolved to the vocabulary where possible. */
export interface IngredientRef {
  /** Matching key: of the vocabulary's INCI name when resolved, else of the label name itself. */
  key: string;
  /** The name as written on the label. */
  name: string;
  /** The vocabulary's INCI name, or null when the name is not in the vocabulary. */
  inci: string | null;
  group: AllergenGroup | null;
  trivial: boolean;
}

/**
 * A label name as an ingredient reference. A name the vocabulary lacks still counts, under its own key,
 * and is never trivial: an unknown substance is not assumed harmless.
 */
export function ingredientRef(name: string, vocabulary: IngredientVocabulary): IngredientRef {
  const hit = resolveIngredient(name, vocabulary);
  if (hit) return { key: normaliseInciName(hit.inci), name, inci: hit.inci, group: hit.group, trivial: hit.trivial };
  return { key: normaliseInciName(name), name, inci: null, group: null, trivial: false };
}

/** A product's label names as ingredient references, in label order, each ingredient once. */
export function resolveIngredientList(names: readonly string[], vocabulary: IngredientVocabulary): IngredientRef[] {
  const seen = new Set<string>();
  const out: IngredientRef[] = [];
  for (const name of names) {
    const ref = ingredientRef(name, vocabulary);
    if (!ref.key || seen.has(ref.key)) continue;
    seen.add(ref.key);
    out.push(ref);
  }
  return out;
}

/** Ingredients two products both contain, carriers left out, in the first product's order. */
export function sharedNonTrivialIngredients(a: readonly IngredientRef[], b: readonly IngredientRef[]): IngredientRef[] {
  const inB = new Set(b.filter((r) => !r.trivial).map((r) => r.key));
  const out = new Map<string, IngredientRef>();
  for (const r of a) if (!r.trivial && inB.has(r.key) && !out.has(r.key)) out.set(r.key, r);
  return [...out.values()];
}

/** One name of a printed ingredient list. */
export interface LabelEntry {
  name: string;
  /** Listed after "may contain" or "+/-": a shade-range colourant that may be present. */
  mayContain: boolean;
}

const LEAD_WORD = /^\s*(?:ingredients|ingr[ée]dients|inci)\s*[:：.-]?\s*/i;
/** "May contain", "+/-" or "±" opening the shade-range colourants, possibly in square brackets. */
const MAY_CONTAIN = /(?:^|[\s.,;])(\[?)\s*(?:may\s+contain|peut\s+contenir|\+\s*\/\s*-|±)\s*(?:\(\s*\+\s*\/\s*-\s*\)|\[\s*\+\s*\/\s*-\s*\])?\s*[:：]?/i;
/** The full stop closing the list, but not the one of "Alcohol Denat.". */
const LIST_END = /(?<!\bdenat)[*†‡]*\.\s*$/i;
/** A footnote after the list, such as ". *Fragrance allergen". */
const FOOTNOTE = /\.\s+[*†‡]+\s*\p{L}[^,]*$/u;

function splitTopLevel(s: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < s.length; i++) {
    const ch = s[i]!;
    if (ch === '(') depth++;
    else if (ch === ')') depth = Math.max(0, depth - 1);
    else if ((ch === ',' || ch === ';') && depth === 0) {
      // "1,2-Hexanediol": a comma between digits belongs to the name.
      if (ch === ',' && /\d/.test(s[i - 1] ?? '') && /\d/.test(s[i + 1] ?? '')) continue;
      parts.push(s.slice(start, i));
      start = i + 1;
    }
  }
  parts.push(s.slice(start));
  return parts;
}

function tidy(name: string): string {
  return name
    .replace(/^[\s*†‡]+|[\s*†‡]+$/g, '')
    .replace(/\s+/g, ' ')
    .trim();
}

function entries(text: string, mayContain: boolean): LabelEntry[] {
  return splitTopLevel(text)
    .map(tidy)
    .filter((name) => name.length > 0)
    .map((name) => ({ name, mayContain }));
}

/**
 * A printed ingredient list as entries in label order: the leading word "Ingredients" and any closing
 * footnote dropped, split on commas outside brackets, footnote marks removed, and the colourants after
 * "may contain" or "+/-" marked as such.
 */
export function parseInciLabel(text: string): LabelEntry[] {
  const body = text
    .normalize('NFKC')
    .replace(/\s+/g, ' ')
    .replace(LEAD_WORD, '')
    .replace(FOOTNOTE, '')
    .replace(LIST_END, '');
  const marker = MAY_CONTAIN.exec(body);
  if (!marker) return entries(body, false);
  const main = body.slice(0, marker.index);
  let rest = body.slice(marker.index + marker[0].length);
  let after = '';
  if (marker[1] === '[') {
    const close = rest.indexOf(']');
    if (close >= 0) [rest, after] = [rest.slice(0, close), rest.slice(close + 1)];
  }
  return [...entries(main, false), ...entries(rest, true), ...entries(after, false)];
}

/** The names of a printed ingredient list in label order, "may contain" colourants included. */
export function parseInciList(text: string): string[] {
  return parseInciLabel(text).map((e) => e.name);
}

/** A declared allergy as the lead links it: to one ingredient, or to a whole allergen group ("fragrance"). */
export type DeclaredAllergy = { kind: 'ingredient'; key: string; name: string } | { kind: 'group'; group: AllergenGroup };

let groupWords: Map<string, AllergenGroup> | null = null;

/** Each allergen group (but "other") by its id and its label, normalised; in group order, the first claim wins. */
function groupByWord(): ReadonlyMap<string, AllergenGroup> {
  if (!groupWords) {
    groupWords = new Map();
    for (const g of ALLERGEN_GROUPS) {
      if (g === 'other') continue;
      for (const word of [normaliseInciName(g), normaliseInciName(ALLERGEN_GROUP_LABELS[g])]) if (!groupWords.has(word)) groupWords.set(word, g);
    }
  }
  return groupWords;
}

/**
 * The vocabulary link for an allergy typed in words: an allergen group by its id or label first, since
 * "fragrance" or "latex" in a performer's words means the family, then a known ingredient. "Other" is no
 * group anyone is allergic to, so it never matches.
 */
export function resolveDeclaredAllergy(text: string, vocabulary: IngredientVocabulary): DeclaredAllergy | null {
  const group = groupByWord().get(normaliseInciName(text));
  if (group) return { kind: 'group', group };
  const hit = resolveIngredient(text, vocabulary);
  return hit ? { kind: 'ingredient', key: normaliseInciName(hit.inci), name: hit.inci } : null;
}

/** Whether an ingredient falls under a declared allergy; carriers count here, since a declared allergy is the performer's own word. */
export function matchesAllergy(ref: IngredientRef, allergy: DeclaredAllergy): boolean {
  return allergy.kind === 'ingredient' ? ref.key === allergy.key : ref.group === allergy.group;
}
