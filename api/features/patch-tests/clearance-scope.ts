import { declaredAllergiesFromAnswers } from '#shared/domain/declared-allergies.ts';
import type { Db } from '../../db/index.ts';
import { currentFormulationIds, productsWithCurrentFormulation } from '../catalogue/index.ts';
import { listDeclaredAllergyAnswers } from '../consents/index.ts';
import { formulationFactsOf, keptTestedSummary, listingOf, NO_VOCABULARY, readClearanceStamps, requiredPointsOf, sharedOnlyRows, splitListing, testedProductsOf, vocabularyOf } from './clearance-cache.ts';
import { decide, type ClearanceFacts } from './clearance-loader.ts';
import { listOverrides } from './clearance-repo.ts';

export interface TableFacts extends ClearanceFacts {
  /**
   * The products reached only through a non-trivial ingredient shared with a formulation that reacted
   * (not tested, not decided, no declared allergy): how many, and the page asked for (all when none is).
   */
  shared: { total: number; results: ClearanceFacts['results'] };
}

/**
 * The clearance table of one performer: the same answers `loadClearanceFacts` gives for the whole
 * catalogue, for the products that can be anything but "not tested" for them, read without the catalogue.
 * Those are the products tested on this performer (any formulation), those whose current formulation
 * the lead overrode, and those whose current formulation lists an ingredient of a declared allergy or a
 * non-trivial ingredient of a formulation that reacted. Every other product is Untested for the reason
 * "not tested", which the table leaves out. The products reached only through a shared ingredient can run
 * to thousands on a large catalogue: they are counted, and only the page asked for is read and decided.
 * A fixed number of queries in at most five rounds, whatever the counts; fewer when `clearance-cache.ts` holds them.
 */
export async function loadTableFacts(db: Db, q: { performerId: string; now: Date; sharedPage?: { page: number; pageSize: number } }): Promise<TableFacts> {
  const [stamps, overrides, answers] = await Promise.all([readClearanceStamps(db, q.performerId), listOverrides(db, q.performerId), listDeclaredAllergyAnswers(db, q.performerId)]);
  const tested = await testedProductsOf(db, q.performerId, stamps);
  const summary = keptTestedSummary(tested);
  const reactedIds = summary.reactedFormulationIds;
  const [requiredPoints, testedFacts, vocabulary] = await Promise.all([
    requiredPointsOf(db, summary.protocolVersionIds, stamps),
    formulationFactsOf(db, summary.formulationIds, stamps),
    answers.length > 0 || reactedIds.size > 0 ? vocabularyOf(db, stamps) : Promise.resolve(NO_VOCABULARY),
  ]);

  // What to look for in the catalogue: the non-trivial ingredients of what reacted, and the declared allergies.
  const reactedKeys = new Set(testedFacts.filter((f) => reactedIds.has(f.formulationId)).flatMap((f) => (f.ingredients ?? []).filter((r) => !r.trivial).map((r) => r.key)));
  const allergies = answers.length > 0 ? declaredAllergiesFromAnswers(answers, vocabulary.index) : [];
  const allergyKeys = new Set(allergies.flatMap((a) => (a.kind === 'ingredient' ? [a.key] : [])));
  const allergyGroups = new Set(allergies.flatMap((a) => (a.kind === 'group' ? [a.group] : [])));
  const idsOf = (index: ReadonlyMap<string, readonly string[]>, keys: ReadonlySet<string>) => [...keys].flatMap((k) => index.get(k) ?? []);
  const sharedIngredientIds = idsOf(vocabulary.nonTrivialIdsByKey, reactedKeys);
  const allergyIngredientIds = [...idsOf(vocabulary.idsByKey, allergyKeys), ...idsOf(vocabulary.idsByGroup, allergyGroups)];
  const [listing, overridden] = await Promise.all([
    listingOf(db, { allergyIds: allergyIngredientIds, sharedIds: sharedIngredientIds, unlinked: reactedKeys.size > 0 || allergyKeys.size > 0 }, stamps),
    productsWithCurrentFormulation(
      db,
      overrides.map((o) => o.formulationId),
    ),
  ]);
  // The table proper: what was tested, decided, or matches a declared allergy (which outranks sharing).
  const split = splitListing(listing, { allergy: allergyKeys, reacted: reactedKeys });
  const core = new Set([...summary.productIds, ...overridden, ...split.allergyProductIds]);
  // The listing comes in the catalogue's order (by name), so a page is the same slice however it is asked for.
  const sharedOnly = sharedOnlyRows(split, core, q.sharedPage ? { from: (q.sharedPage.page - 1) * q.sharedPage.pageSize, to: q.sharedPage.page * q.sharedPage.pageSize } : undefined);
  const page = sharedOnly.rows;
  const current = [...(await currentFormulationIds(db, [...core])), ...page.map((r) => ({ productId: r.productId, formulationId: r.formulationId }))];
  const known = new Set(summary.formulationIds);
  const more = await formulationFactsOf(
    db,
    current.map((c) => c.formulationId).filter((id) => !known.has(id)),
    stamps,
  );
  const facts = decide({ tested, overrides, declaredAllergies: allergies, requiredPoints, current, facts: [...testedFacts, ...more], now: q.now, catalogueStamp: stamps.catalogue });
  const paged = new Set(page.map((c) => c.productId));
  return { ...facts, results: facts.results.filter((r) => !paged.has(r.productId)), shared: { total: sharedOnly.total, results: facts.results.filter((r) => paged.has(r.productId)) } };
}
