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
