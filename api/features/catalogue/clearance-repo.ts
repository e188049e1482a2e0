import { sql } from 'kysely';
import type { Ingredient } from '#shared/domain/ingredients.ts';
import type { Db } from '../../db/index.ts';

/**
 * The current formulation of each product asked for, or of every product in the catalogue when none
 * are named, by product name: one query, whatever the count.
 */
export async function currentFormulationIds(db: Db, productIds?: readonly string[]): Promise<{ productId: string; formulationId: string }[]> {
  if (productIds && productIds.length === 0) return [];
  let q = db.selectFrom('products').select(['id', 'current_formulation_id']).where('current_formulation_id', 'is not', null);
  if (productIds) q = q.where('id', 'in', [...new Set(productIds)]);
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

/** A current formulation's ingredient row, as `currentFormulationsListing` finds it. */
export interface ListingRow {
  productId: string;
  formulationId: string;
  ingredientId: string | null;
  labelName: string;
}

/**
 * The ingredient rows of current formulations that list one of the given ingredients, and (when asked)
 * every row not linked to the vocabulary, whose printed name the caller compares itself: one query, by
 * the ingredient index and the partial index of unlinked rows, never the whole catalogue.
 */
export async function currentFormulationsListing(db: Db, q: { ingredientIds: readonly string[]; unlinked: boolean }): Promise<ListingRow[]> {
  if (q.ingredientIds.length === 0 && !q.unlinked) return [];
  const rows = await db
    .selectFrom('formulation_ingredients as fi')
    .innerJoin('product_formulations as f', 'f.id', 'fi.formulation_id')
    .innerJoin('products as p', (j) => j.onRef('p.id', '=', 'f.product_id').onRef('p.current_formulation_id', '=', 'f.id'))
    .select(['p.id as product_id', 'fi.formulation_id', 'fi.ingredient_id', 'fi.label_name'])
    .where((eb) => {
      const ors = [];
      if (q.ingredientIds.length > 0) ors.push(eb('fi.ingredient_id', 'in', [...new Set(q.ingredientIds)]));
      if (q.unlinked) ors.push(eb('fi.ingredient_id', 'is', null));
      return eb.or(ors);
    })
    .execute();
  return rows.map((r) => ({ productId: r.product_id, formulationId: r.formulation_id, ingredientId: r.ingredient_id, labelName: r.label_name }));
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
