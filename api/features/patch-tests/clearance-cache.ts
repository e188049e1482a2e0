import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import type { FormulationFacts } from '#shared/domain/clearance.ts';
import { buildVocabulary, normaliseInciName, type Ingredient, type IngredientVocabulary } from '#shared/domain/ingredients.ts';
import { isPositive } from '#shared/domain/icdrg.ts';
import { requiredPointIds } from '#shared/domain/protocols.ts';
import type { Db } from '../../db/index.ts';
import { currentFormulationsListing, listVocabularyWithIds, loadFormulationsWithIngredients } from '../catalogue/index.ts';
import { findProtocolVersions } from '../protocols/index.ts';
import { listTestedProducts, type TestedProductRow } from './clearance-repo.ts';

/**
 * What clearance reads that changes seldom, kept in this process and checked against the stamps the
 * database moves on every change (migration `clearance_stamps`): a performer's tested products with
 * their readings, and the catalogue's formulations, vocabulary, protocol versions and the listings of
 * products by ingredient the clearance table asks for. The stamps are read
 * first, in their own round, and anything read after them is kept under them: it is at least as new as
 * they say, so a change that lands meanwhile only makes the next request read again. Several API
 * processes each keep their own and stay right, since the stamps live in PostgreSQL. A key with no stamp
 * (rows written with triggers off) is read every time. Kept values are frozen: callers share them.
 */
export interface ClearanceStamps {
  performer: string | null;
  catalogue: string | null;
}

const CATALOGUE = 'catalogue';
const performerKey = (performerId: string) => `performer:${performerId}`;

/** The stamps of one performer's tests and of the catalogue: one query. */
export async function readClearanceStamps(db: Db, performerId: string): Promise<ClearanceStamps> {
  const rows = await db
    .selectFrom('clearance_stamps')
    .select(['key', 'stamp'])
    .where('key', 'in', [performerKey(performerId), CATALOGUE])
    .execute();
  const of = (k: string) => rows.find((r) => r.key === k)?.stamp ?? null;
  return { performer: of(performerKey(performerId)), catalogue: of(CATALOGUE) };
}

interface Kept {
  tested: LRUCache<string, { stamp: string; rows: readonly TestedProductRow[] }>;
  catalogue: {
    stamp: string | null;
    formulations: LRUCache<string, FormulationFacts>;
    vocabulary: KeptVocabulary | null;
    protocols: Map<string, readonly string[]>;
    listings: LRUCache<string, readonly Listing[]>;
  };
}

/** The ingredient vocabulary as clearance reads it: the index by every name, and the ids by key and by group. */
export interface KeptVocabulary {
  index: IngredientVocabulary;
  /** The ids of the rows by their normalised INCI name, and of the non-trivial ones alone. */
  idsByKey: ReadonlyMap<string, readonly string[]>;
  nonTrivialIdsByKey: ReadonlyMap<string, readonly string[]>;
  /** The ids of the rows by allergen group. */
  idsByGroup: ReadonlyMap<string, readonly string[]>;
}

function groupIds<T>(rows: readonly T[], keyOf: (row: T, i: number) => string | null, idOf: (row: T) => string): ReadonlyMap<string, readonly string[]> {
  const out = new Map<string, string[]>();
  rows.forEach((row, i) => {
    const key = keyOf(row, i);
    if (key === null) return;
    const list = out.get(key);
    if (list) list.push(idOf(row));
    else out.set(key, [idOf(row)]);
  });
  return out;
}

/** The vocabulary as a loader keeps it, its rows frozen (the index hands them out). */
function keepVocabulary(rows: readonly (Ingredient & { id: string })[]): KeptVocabulary {
  deepFreeze(rows);
  const keys = rows.map((r) => normaliseInciName(r.inci));
  return Object.freeze({
    index: buildVocabulary(rows),
    idsByKey: groupIds(rows, (_, i) => keys[i]!, (r) => r.id),
    nonTrivialIdsByKey: groupIds(rows, (r, i) => (r.trivial ? null : keys[i]!), (r) => r.id),
    idsByGroup: groupIds(rows, (r) => r.group, (r) => r.id),
  });
}

/** What a loader uses when it needs no vocabulary (no declared allergy, nothing reacted). */
export const NO_VOCABULARY: KeptVocabulary = keepVocabulary([]);

/** A listing row with its unlinked label names normalised (`normaliseInciName`), once, as it is kept. */
type Listing = Awaited<ReturnType<typeof currentFormulationsListing>>[number] & { unlinkedKeys: readonly string[] };
type ListingQuery = Parameters<typeof currentFormulationsListing>[1];

/**
 * Bounds, least recently used out first. Measured on the studio-scale data: a tested product with its
 * readings takes about 1.2 kB of heap, a formulation with its ingredients 3.3 kB, a listing row 0.4 kB,
 * so the three stay under about 65 MB together, and with the tests' facts kept beside the tested rows
 * (0.3 kB a tested product) under about 75 MB. 30,000 tested products hold thirty performers tested
 * as often as the heaviest there (1,005 each) or thousands of ordinary ones; 6,000 formulations are
 * nearly all of a 5,000-product catalogue.
 */
const TESTED_ROWS_KEPT = 30_000;
const FORMULATIONS_KEPT = 6_000;
/** Listing rows kept, counted by product. */
const LISTING_ROWS_KEPT = 20_000;

const kept = new WeakMap<Db, Kept>();

function keptFor(db: Db): Kept {
  let k = kept.get(db);
  if (!k) {
    k = {
      tested: new LRUCache({ maxSize: TESTED_ROWS_KEPT, sizeCalculation: (v) => v.rows.length + 1 }),
      catalogue: {
        stamp: null,
        formulations: new LRUCache({ max: FORMULATIONS_KEPT }),
        vocabulary: null,
        protocols: new Map(),
        listings: new LRUCache({ maxSize: LISTING_ROWS_KEPT, sizeCalculation: (v) => v.length + 1 }),
      },
    };
    kept.set(db, k);
  }
  return k;
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

/** The catalogue part, emptied when its stamp moved (or is gone). */
function catalogueFor(db: Db, stamp: string | null): Kept['catalogue'] {
  const c = keptFor(db).catalogue;
  if (c.stamp !== stamp || stamp === null) {
    c.stamp = stamp;
    c.formulations.clear();
    c.vocabulary = null;
    c.protocols.clear();
    c.listings.clear();
  }
  return c;
}

/** `listTestedProducts`, kept while the performer's stamp stands. */
export async function testedProductsOf(db: Db, performerId: string, stamps: ClearanceStamps): Promise<readonly TestedProductRow[]> {
  const tested = keptFor(db).tested;
  const hit = tested.get(performerId);
  if (hit && stamps.performer !== null && hit.stamp === stamps.performer) return hit.rows;
  const rows = await listTestedProducts(db, performerId);
  if (stamps.performer !== null) tested.set(performerId, { stamp: stamps.performer, rows: deepFreeze(rows) });
  else tested.delete(performerId);
  return rows;
}

/**
 * A value worked out from an array this module keeps (frozen), kept beside it in a weak map so it goes
 * when the array does, and reused while `sig` (what else the value was worked out from) is the same.
 * One value an array: a different `sig` replaces it. An array not kept, or a null `sig`: built every time.
 * Never change what it hands back.
 */
function keptBeside<T>(): (owner: readonly unknown[], sig: string | null, build: () => T) => T {
  const beside = new WeakMap<readonly unknown[], { sig: string; value: T }>();
  return (owner, sig, build) => {
    if (sig === null || !Object.isFrozen(owner)) return build();
    const hit = beside.get(owner);
    if (hit && hit.sig === sig) return hit.value;
    const value = build();
    beside.set(owner, { sig, value });
    return value;
  };
}

const testFacts = keptBeside<unknown>();

/**
 * The tests' part of a clearance answer (`prepareTests` over the tested products with their protocols'
 * points), worked out once for tested rows this module keeps and reused while the catalogue's stamp, under
 * which the points were read, stands: about 0.3 kB more a tested product (the readings are the kept rows'
 * own). Rows not kept, or no catalogue stamp: built every time. Never change what it hands back.
 */
export function keptTestFacts<T>(tested: readonly TestedProductRow[], catalogueStamp: string | null, build: () => T): T {
  return testFacts(tested, catalogueStamp, build) as T;
}

/** What the clearance table reads off a performer's tested products, whatever else it is asked. */
export interface TestedSummary {
  formulationIds: readonly string[];
  productIds: readonly string[];
  protocolVersionIds: readonly string[];
  /** The formulations with a positive reading in any test. */
  reactedFormulationIds: ReadonlySet<string>;
}

const testedSummaries = keptBeside<TestedSummary>();

/** The ids the clearance table needs from the tested products, worked out once while they are kept. */
export function keptTestedSummary(tested: readonly TestedProductRow[]): TestedSummary {
  return testedSummaries(tested, '', () => ({
    formulationIds: [...new Set(tested.map((t) => t.formulationId))],
    productIds: [...new Set(tested.map((t) => t.productId))],
    protocolVersionIds: [...new Set(tested.map((t) => t.protocolVersionId))],
    reactedFormulationIds: new Set(tested.filter((t) => t.readings.some((r) => isPositive(r.code))).map((t) => t.formulationId)),
  }));
}

/** A listing sorted for the clearance table: the products it adds to the table, and those sharing an ingredient. */
export interface ListingSplit {
  /** Products listing an ingredient of a declared allergy (which outranks sharing). */
  allergyProductIds: readonly string[];
  /** The rest of the rows listing a non-trivial ingredient of a formulation that reacted, in the listing's order. */
  sharing: readonly Listing[];
  /** How many rows of `sharing` each product has. */
  sharingRowsOf: ReadonlyMap<string, number>;
}

const listingSplits = keptBeside<ListingSplit>();

/**
 * The rows of `split.sharing` whose product is not in `core`, in order: how many, and those from the
 * `from`-th to before the `to`-th (all when no range is given). Counted from the products in `core`
 * and walked only as far as the range, so the first page of thousands costs a few dozen steps.
 */
export function sharedOnlyRows(split: ListingSplit, core: ReadonlySet<string>, range?: { from: number; to: number }): { total: number; rows: Listing[] } {
  let hidden = 0;
  for (const id of core) hidden += split.sharingRowsOf.get(id) ?? 0;
  const total = split.sharing.length - hidden;
  const from = range?.from ?? 0;
  const to = range?.to ?? total;
  const rows: Listing[] = [];
  let seen = 0;
  for (const r of split.sharing) {
    if (seen >= to) break;
    if (core.has(r.productId)) continue;
    if (seen >= from) rows.push(r);
    seen++;
  }
  return { total, rows };
}

/**
 * Splits a listing by what its rows match: a declared allergy (by ingredient, or an unlinked label name
 * with an allergy's key) or else an ingredient shared with what reacted (likewise). Kept beside a kept
 * listing for the keys it was split by.
 */
export function splitListing(listing: readonly Listing[], keys: { allergy: ReadonlySet<string>; reacted: ReadonlySet<string> }): ListingSplit {
  const sig = JSON.stringify([[...keys.allergy].sort(), [...keys.reacted].sort()]);
  return listingSplits(listing, sig, () => {
    const allergyProductIds: string[] = [];
    const sharing: Listing[] = [];
    for (const r of listing) {
      if (r.allergy || r.unlinkedKeys.some((k) => keys.allergy.has(k))) allergyProductIds.push(r.productId);
      else if (r.shares || r.unlinkedKeys.some((k) => keys.reacted.has(k))) sharing.push(r);
    }
    const sharingRowsOf = new Map<string, number>();
    for (const r of sharing) sharingRowsOf.set(r.productId, (sharingRowsOf.get(r.productId) ?? 0) + 1);
    return { allergyProductIds, sharing, sharingRowsOf };
  });
}

/** `loadFormulationsWithIngredients`, reading only those not kept under the catalogue's stamp. */
export async function formulationFactsOf(db: Db, formulationIds: readonly string[], stamps: ClearanceStamps): Promise<FormulationFacts[]> {
  const c = catalogueFor(db, stamps.catalogue);
  const ids = [...new Set(formulationIds)];
  const missing = ids.filter((id) => !c.formulations.has(id));
  const read = await loadFormulationsWithIngredients(db, missing);
  const got = new Map(read.map((f) => [f.formulationId, f]));
  if (stamps.catalogue !== null) for (const f of read) c.formulations.set(f.formulationId, deepFreeze(f));
  return ids.flatMap((id) => {
    const f = got.get(id) ?? c.formulations.get(id);
    return f ? [f] : [];
  });
}

/** The ingredient vocabulary with ids, normalised names and its index, kept under the catalogue's stamp. */
export async function vocabularyOf(db: Db, stamps: ClearanceStamps): Promise<KeptVocabulary> {
  const c = catalogueFor(db, stamps.catalogue);
  if (c.vocabulary) return c.vocabulary;
  const kept = keepVocabulary(await listVocabularyWithIds(db));
  if (stamps.catalogue !== null) c.vocabulary = kept;
  return kept;
}

/** The reading points each protocol version requires (by version id), kept under the catalogue's stamp. */
export async function requiredPointsOf(db: Db, versionIds: readonly string[], stamps: ClearanceStamps): Promise<Map<string, readonly string[]>> {
  const c = catalogueFor(db, stamps.catalogue);
  const ids = [...new Set(versionIds)];
  const missing = ids.filter((id) => !c.protocols.has(id));
  const out = new Map<string, readonly string[]>();
  if (missing.length > 0) {
    for (const [id, v] of await findProtocolVersions(db, missing)) {
      const points = deepFreeze(requiredPointIds(v.protocol));
      out.set(id, points);
      if (stamps.catalogue !== null) c.protocols.set(id, points);
    }
  }
  for (const id of ids) if (!out.has(id) && c.protocols.has(id)) out.set(id, c.protocols.get(id)!);
  return out;
}

/** `currentFormulationsListing`, kept under the catalogue's stamp by the ingredients asked for (in any order). */
export async function listingOf(db: Db, q: ListingQuery, stamps: ClearanceStamps): Promise<readonly Listing[]> {
  const c = catalogueFor(db, stamps.catalogue);
  const key = createHash('sha1')
    .update(`${q.unlinked}|${[...new Set(q.allergyIds)].sort().join(',')}|${[...new Set(q.sharedIds)].sort().join(',')}`)
    .digest('base64');
  const hit = c.listings.get(key);
  if (hit) return hit;
  const rows = (await currentFormulationsListing(db, q)).map((r) => ({ ...r, unlinkedKeys: r.unlinkedNames.map(normaliseInciName) }));
  if (stamps.catalogue !== null) c.listings.set(key, deepFreeze(rows));
  return rows;
}

/** Drops everything kept for this database handle, so the next read starts cold (for tests and the benchmark). */
export function forgetClearanceKept(db: Db): void {
  kept.delete(db);
}
