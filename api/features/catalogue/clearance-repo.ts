import { sql, type SqlBool } from 'kysely';
import type { Ingredient } from '#shared/domain/ingredients.ts';
import { type Db, idArray } from '../../db/index.ts';

/**
 * The current formulation of each product asked for, or of every product in the catalogue when none
 * are named, by product name: one query, whatever the count.
 */
export async function currentFormulationIds(db: Db, productIds?: readonly string[]): Promise<{ productId: string; formulationId: string }[]> {
  if (productIds && productIds.length === 0) return [];
  let q = db.selectFrom('products').select(['id', 'current_formulation_id']).where('current_formulation_id', 'is not', null);
  if (productIds) q = q.where(sql<SqlBool>`id = any(${idArray(productIds)})`);
  const rows = await q.orderBy(sql`lower(name)`).orderBy('id').execute();
  return rows.map((r) => ({ productId: r.id, formulationId: r.current_formulation_id! }));
}

/** The whole ingredient vocabulary, to resolve words a performer wrote (a declared allergy) to it. */
export async function listVocabulary(db: Db): Promise<Ingredient[]> {
  const rows = await db.selectFrom('ingredients').select(['inci', 'synonyms', 'cas', 'allergen_group', 'trivial']).orderBy('inci').execute();
  return rows.map((r) => ({ inci: r.inci, synonyms: r.synonyms, cas: r.cas, group: r.allergen_group, trivial: r.trivial }));
}

/** The ingredient vocabulary with ids, for a caller that looks up which formulations list given ingredients. */
export async function listVocabularyWithIds(db: Db): Promise<(Ingredient & { id: string })[]> {
  const rows = await db.selectFrom('ingredients').select(['id', 'inci', 'synonyms', 'cas', 'allergen_group', 'trivial']).orderBy('inci').execute();
  return rows.map((r) => ({ id: r.id, inci: r.inci, synonyms: r.synonyms, cas: r.cas, group: r.allergen_group, trivial: r.trivial }));
}

/** A product whose current formulation lists some of the ingredients asked for, as `currentFormulationsListing` finds it. */
export interface ListingRow {
  productId: string;
  formulationId: string;
  /** Whether its current formulation lists one of the `allergyIds`. */
  allergy: boolean;
  /** Whether its current formulation lists one of the `sharedIds`. */
  shares: boolean;
  /** The printed names of its rows not linked to the vocabulary (when asked for), for the caller to compare. */
  unlinkedNames: string[];
}

/**
 * The products whose current formulation lists one of the given ingredients, and (when asked) those with
 * rows not linked to the vocabulary: one row a product, in the catalogue's order (by name), from one query
 * by the ingredient index and the partial index of unlinked rows, never the whole catalogue. The ids go
 * as arrays, which PostgreSQL plans far better than a list of thousands of parameters.
 */
export async function currentFormulationsListing(db: Db, q: { allergyIds: readonly string[]; sharedIds: readonly string[]; unlinked: boolean }): Promise<ListingRow[]> {
  const ids = [...q.allergyIds, ...q.sharedIds];
  if (ids.length === 0 && !q.unlinked) return [];
  const rows = await db
    .selectFrom('formulation_ingredients as fi')
    .innerJoin('products as p', 'p.current_formulation_id', 'fi.formulation_id')
    .select([
      'p.id as product_id',
      'fi.formulation_id',
      sql<boolean>`coalesce(bool_or(fi.ingredient_id = any(${idArray(q.allergyIds)})), false)`.as('allergy'),
      sql<boolean>`coalesce(bool_or(fi.ingredient_id = any(${idArray(q.sharedIds)})), false)`.as('shares'),
      sql<string[] | null>`array_agg(fi.label_name) filter (where fi.ingredient_id is null)`.as('unlinked_names'),
    ])
    .where((eb) => {
      const ors = [];
      if (ids.length > 0) ors.push(sql<SqlBool>`fi.ingredient_id = any(${idArray(ids)})`);
      if (q.unlinked) ors.push(eb('fi.ingredient_id', 'is', null));
      return eb.or(ors);
    })
    .groupBy(['p.id', 'fi.formulation_id'])
    .orderBy(sql`lower(p.name)`)
    .orderBy('p.id')
    .execute();
  return rows.map((r) => ({ productId: r.product_id, formulationId: r.formulation_id, allergy: r.allergy, shares: r.shares, unlinkedNames: r.unlinked_names ?? [] }));
}

/** The products whose current formulation is one of these. */
export async function productsWithCurrentFormulation(db: Db, formulationIds: readonly string[]): Promise<string[]> {
  if (formulationIds.length === 0) return [];
  const rows = await db
    .selectFrom('product_formulations as f')
    .innerJoin('products as p', (j) => j.onRef('p.id', '=', 'f.product_id').onRef('p.current_formulation_id', '=', 'f.id'))
    .select('p.id')
    .where('f.id', 'in', [...new Set(formulationIds)])
    .execute();
  return rows.map((r) => r.id);
}
