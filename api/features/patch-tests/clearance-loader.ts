import { performerClearance, prepareTests, type ClearanceResult, type FormulationFacts, type TestedProduct } from '#shared/domain/clearance.ts';
import { declaredAllergiesFromAnswers } from '#shared/domain/declared-allergies.ts';
import type { DeclaredAllergy } from '#shared/domain/ingredients.ts';
import type { Db } from '../../db/index.ts';
import { currentFormulationIds } from '../catalogue/index.ts';
import { listDeclaredAllergyAnswers } from '../consents/index.ts';
import { formulationFactsOf, keptTestedSummary, keptTestFacts, NO_VOCABULARY, readClearanceStamps, requiredPointsOf, testedProductsOf, vocabularyOf } from './clearance-cache.ts';
import { listOverrides, type OverrideRow, type TestedProductRow } from './clearance-repo.ts';

export interface PerformerClearancesQuery {
  performerId: string;
  /** The products to answer for (each at its current formulation); every product in the catalogue when left out. */
  productIds?: readonly string[];
  /** Exact formulations to answer for as well, current or not (the materials an appliance piece was made with). */
  formulationIds?: readonly string[];
  now: Date;
}

/** What the loader read, for a caller that also shows the tests (the lead's view) without reading them again. */
export interface ClearanceFacts {
  results: ClearanceResult[];
  tested: readonly TestedProductRow[];
  formulations: Map<string, FormulationFacts>;
}

/**
 * A performer's clearance for each product asked for, from a fixed number of queries whatever the number
 * of products or tests: the stamps, the tested products with their readings, the overrides, the declared
 * allergies (and the vocabulary only when some were written), the protocol versions the tests were booked
 * on, the current formulations asked for, and the ingredients of those and of every tested formulation.
 * What `clearance-cache.ts` keeps is read only when its stamp moved. The answer holds states and reasons
 * only; no code, note or photo.
 */
export async function loadClearanceFacts(db: Db, q: PerformerClearancesQuery): Promise<ClearanceFacts> {
  const [stamps, overrides, answers, current] = await Promise.all([
    readClearanceStamps(db, q.performerId),
    listOverrides(db, q.performerId),
    listDeclaredAllergyAnswers(db, q.performerId),
    currentFormulationIds(db, q.productIds),
  ]);
  const tested = await testedProductsOf(db, q.performerId, stamps);
  const summary = keptTestedSummary(tested);
  const [vocabulary, requiredPoints, facts] = await Promise.all([
    answers.length > 0 ? vocabularyOf(db, stamps) : Promise.resolve(NO_VOCABULARY),
    requiredPointsOf(db, summary.protocolVersionIds, stamps),
    formulationFactsOf(db, [...current.map((c) => c.formulationId), ...(q.formulationIds ?? []), ...summary.formulationIds], stamps),
  ]);
  const declaredAllergies = answers.length > 0 ? declaredAllergiesFromAnswers(answers, vocabulary.index) : [];
  return decide({ tested, overrides, declaredAllergies, requiredPoints, current, facts, extraFormulationIds: q.formulationIds, now: q.now, catalogueStamp: stamps.catalogue });
}

/** A performer's clearance for each product asked for (all products when none are named), from a fixed number of queries. */
export async function performerClearances(db: Db, q: PerformerClearancesQuery): Promise<ClearanceResult[]> {
  return (await loadClearanceFacts(db, q)).results;
}

interface Gathered {
  tested: readonly TestedProductRow[];
  overrides: OverrideRow[];
  /** What the performer's own forms declare, resolved against the vocabulary. */
  declaredAllergies: readonly DeclaredAllergy[];
  /** The reading points each protocol version asks for, by version id. */
  requiredPoints: ReadonlyMap<string, readonly string[]>;
  current: { productId: string; formulationId: string }[];
  facts: FormulationFacts[];
  /** Formulations asked for beyond the current ones (the exact formulation an appliance piece was made with). */
  extraFormulationIds?: readonly string[];
  now: Date;
  /** The catalogue stamp `requiredPoints` was read under: with kept `tested` rows, the tests' facts are kept too. */
  catalogueStamp?: string | null;
}

/** The clearance rule over what was read, in the order of `current`. */
export function decide({ tested, overrides, declaredAllergies, requiredPoints, current, facts, extraFormulationIds = [], now, catalogueStamp = null }: Gathered): ClearanceFacts {
  const formulations = new Map(facts.map((f) => [f.formulationId, f]));
  const { tests, prepared } = keptTestFacts(tested, catalogueStamp, () => {
    const list: TestedProduct[] = tested.map((t) => ({
      testId: t.testId,
      productId: t.productId,
      formulationId: t.formulationId,
      lotId: t.lotId,
      status: t.status,
      appliedAt: t.appliedAt,
      requiredPointIds: requiredPoints.get(t.protocolVersionId) ?? [],
      readings: t.readings,
    }));
    return { tests: list, prepared: prepareTests(list) };
  });
  const testedIds = keptTestedSummary(tested).formulationIds;
  const results = performerClearance({
    formulations: [...new Set([...current.map((c) => c.formulationId), ...extraFormulationIds])].flatMap((id) => (formulations.has(id) ? [formulations.get(id)!] : [])),
    testedFormulations: testedIds.flatMap((id) => (formulations.has(id) ? [formulations.get(id)!] : [])),
    tests,
    prepared,
    declaredAllergies,
    overrides: overrides.map((o) => ({ formulationId: o.formulationId, state: o.state, by: o.by, at: o.at, expiresAt: o.expiresAt, note: '' })),
    now,
  });
  return { results, tested, formulations };
}
