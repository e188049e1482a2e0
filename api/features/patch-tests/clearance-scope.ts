import { declaredAllergiesFromAnswers } from '#shared/domain/declared-allergies.ts';
import { isPositive } from '#shared/domain/icdrg.ts';
import { buildVocabulary, normaliseInciName } from '#shared/domain/ingredients.ts';
import type { Db } from '../../db/index.ts';
import { currentFormulationIds, currentFormulationsListing, listVocabularyWithIds, loadFormulationsWithIngredients, productsWithCurrentFormulation } from '../catalogue/index.ts';
import { listDeclaredAllergyAnswers } from '../consents/index.ts';
import { findProtocolVersions } from '../protocols/index.ts';
import { decide, type ClearanceFacts } from './clearance-loader.ts';
import { listOverrides, listTestedProducts } from './clearance-repo.ts';

/**
 * The clearance table of one performer: the same answers `loadClearanceFacts` gives for the whole
 * catalogue, for the products that can be anything but "not tested" for them, read without the catalogue.
 * Those are the products tested on this performer (any formulation), those whose current formulation
 * the lead overrode, and those whose current formulation lists an ingredient of a declared allergy or a
 * non-trivial ingredient of a formulation that reacted. Every other product is Untested for the reason
 * "not tested", which the table leaves out. A fixed number of queries in three rounds, whatever the counts.
 */
export async function loadTableFacts(db: Db, q: { performerId: string; now: Date }): Promise<ClearanceFacts> {
  const [tested, overrides, answers] = await Promise.all([listTestedProducts(db, q.performerId), listOverrides(db, q.performerId), listDeclaredAllergyAnswers(db, q.performerId)]);
  const testedIds = [...new Set(tested.map((t) => t.formulationId))];
  const reactedIds = new Set(tested.filter((t) => t.readings.some((r) => isPositive(r.code))).map((t) => t.formulationId));
  const [protocols, testedFacts, vocabulary] = await Promise.all([
    findProtocolVersions(
      db,
      tested.map((t) => t.protocolVersionId),
    ),
    loadFormulationsWithIngredients(db, testedIds),
    answers.length > 0 || reactedIds.size > 0 ? listVocabularyWithIds(db) : Promise.resolve([]),
  ]);

  // What to look for in the catalogue: the non-trivial ingredients of what reacted, and the declared allergies.
  const reactedKeys = new Set(testedFacts.filter((f) => reactedIds.has(f.formulationId)).flatMap((f) => (f.ingredients ?? []).filter((r) => !r.trivial).map((r) => r.key)));
  const allergies = answers.length > 0 ? declaredAllergiesFromAnswers(answers, buildVocabulary(vocabulary)) : [];
  const allergyKeys = new Set(allergies.flatMap((a) => (a.kind === 'ingredient' ? [a.key] : [])));
  const allergyGroups = new Set(allergies.flatMap((a) => (a.kind === 'group' ? [a.group] : [])));
  const ingredientIds = vocabulary
    .filter((v) => {
      const key = normaliseInciName(v.inci);
      return (!v.trivial && reactedKeys.has(key)) || allergyKeys.has(key) || allergyGroups.has(v.group);
    })
    .map((v) => v.id);
  const byName = (name: string) => {
    const key = normaliseInciName(name);
    return reactedKeys.has(key) || allergyKeys.has(key);
  };
  const [listing, overridden] = await Promise.all([
    currentFormulationsListing(db, { ingredientIds, unlinked: reactedKeys.size > 0 || allergyKeys.size > 0 }),
    productsWithCurrentFormulation(
      db,
      overrides.map((o) => o.formulationId),
    ),
  ]);
  const products = new Set([...tested.map((t) => t.productId), ...overridden, ...listing.filter((r) => r.ingredientId !== null || byName(r.labelName)).map((r) => r.productId)]);
  const current = await currentFormulationIds(db, [...products]);
  const known = new Set(testedIds);
  const more = await loadFormulationsWithIngredients(
    db,
    current.map((c) => c.formulationId).filter((id) => !known.has(id)),
  );
  return decide({ tested, overrides, answers, vocabulary, protocols, current, facts: [...testedFacts, ...more], now: q.now });
}
