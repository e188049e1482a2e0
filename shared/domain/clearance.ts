/**
 * Clearance of one performer for each product formulation: Cleared, Caution, Do not use, Pending or
 * Untested, with reasons in plain words. The result is what staff without medical access may see, so it
 * carries no grade, note or photo.
 *
 * Input shapes are built from a few list queries for one performer (their tested products with readings,
 * the formulations those tests and the asked-for products name, declared allergies, overrides); one call
 * answers every formulation asked about.
 */
import { isPositive, type GradedCode, type IcdrgCode } from './icdrg.ts';
import { matchesAllergy, type DeclaredAllergy, type IngredientRef } from './ingredients.ts';
import type { TestStatus } from './reading-schedule.ts';

/** The five answers Plinth gives about a performer and a product formulation. */
export const CLEARANCE_STATES = ['cleared', 'caution', 'do_not_use', 'pending', 'untested'] as const;
/** One clearance answer. */
export type ClearanceState = (typeof CLEARANCE_STATES)[number];

/** The states' names as staff see them. */
export const CLEARANCE_STATE_LABELS: Record<ClearanceState, string> = {
  cleared: 'Cleared',
  caution: 'Caution',
  do_not_use: 'Do not use',
  pending: 'Pending',
  untested: 'Untested',
};

/** Icon names of the app's status icon set, so each state reads by shape and word, not colour alone. */
export type ClearanceIcon = 'check' | 'warning' | 'blocked' | 'clock' | 'missing';
/** One icon per state, all different. */
export const CLEARANCE_STATE_ICONS: Record<ClearanceState, ClearanceIcon> = {
  cleared: 'check',
  caution: 'warning',
  do_not_use: 'blocked',
  pending: 'clock',
  untested: 'missing',
};

/** Sort order for tables: what stops an application first. */
export const CLEARANCE_SEVERITY: Record<ClearanceState, number> = { do_not_use: 0, caution: 1, pending: 2, untested: 3, cleared: 4 };

/** The lead may set any state but Pending, which only outstanding readings can make. */
export const OVERRIDE_STATES = ['cleared', 'caution', 'do_not_use', 'untested'] as const;
/** A state the lead may set by override. */
export type OverrideState = (typeof OVERRIDE_STATES)[number];

/** Every reason Plinth gives, in non-medical words anyone on the production may read. */
export const CLEARANCE_REASON_TEXTS = {
  lead_decision: 'set by the designated lead',
  override_lapsed: "the lead's earlier decision no longer applies",
  reacted: 'reacted in testing',
  declared_allergy: 'declared allergy to an ingredient',
  shared_ingredient: 'shares an ingredient with a product that reacted',
  doubtful_final: 'doubtful reading at the final check; retest advised',
  doubtful_reading: 'doubtful reading in testing',
  irritation: 'skin irritation in testing',
  test_booked: 'test booked, not yet applied',
  readings_outstanding: 'readings outstanding',
  no_reaction: 'no reaction through the final reading',
  last_test_expired: 'last test expired',
  test_incomplete: 'last test not completed',
  new_formulation: 'not tested since the formulation changed',
  not_tested: 'not tested',
  ingredients_not_recorded: 'ingredients not recorded',
} as const;
/** A reason, by code. */
export type ClearanceReasonCode = keyof typeof CLEARANCE_REASON_TEXTS;

/** A reason with its words. */
export interface ClearanceReason {
  code: ClearanceReasonCode;
  text: string;
}

/** One formulation of a product: its own version of the ingredient list. A new lot is not a new formulation. */
export interface FormulationFacts {
  formulationId: string;
  productId: string;
  productName: string;
  /** In label order, from `resolveIngredientList`; null or empty when the ingredients were never recorded. */
  ingredients: readonly IngredientRef[] | null;
}

/** One product on one patch test (a test × tested-product row) with every reading recorded for it. */
export interface TestedProduct {
  testId: string;
  productId: string;
  /** The formulation of the lot that was tested. */
  formulationId: string;
  /** The lot tested; clearance does not depend on it, since a new lot of the same formulation needs no new test. */
  lotId?: string | null;
  status: TestStatus;
  appliedAt: Date | null;
  /** From `requiredPointIds(protocol)` of the protocol the test was booked with. */
  requiredPointIds: readonly string[];
  readings: readonly { pointId: string; readAt: Date; code: IcdrgCode }[];
}

/** The lead's decision on one formulation for this performer. */
export interface ClearanceOverride {
  formulationId: string;
  state: OverrideState;
  /** Who set it, as it should be shown (name or user id). */
  by: string;
  at: Date;
  /** Required when setting an override; kept with the medical record and never returned here. */
  note: string;
  expiresAt?: Date | null;
}

/** Everything one call needs for one performer, from a few list queries. */
export interface PerformerClearanceInput {
  /** The formulations to answer for, usually each product's current one. */
  formulations: readonly FormulationFacts[];
  /** Ingredients of every formulation the tests name (may repeat `formulations`), so a reaction elsewhere can be traced. */
  testedFormulations: readonly FormulationFacts[];
  /** Every tested product of this performer, any product, any status. */
  tests: readonly TestedProduct[];
  /** `prepareTests(tests)`, when the caller keeps it for tests that have not changed; worked out here otherwise. */
  prepared?: PreparedTests;
  declaredAllergies: readonly DeclaredAllergy[];
  /** The overrides in force for this performer; the latest per formulation counts. */
  overrides: readonly ClearanceOverride[];
  now: Date;
  /** How long a negative test clears a formulation; 12 months unless the production sets otherwise. */
  validityMonths?: number;
}

/** The answer for one formulation, fit for staff without medical access. */
export interface ClearanceResult {
  productId: string;
  formulationId: string;
  productName: string;
  state: ClearanceState;
  /** In order of weight, the deciding reason first. Non-medical words only. */
  reasons: ClearanceReason[];
  validUntil: Date | null;
  retestAdvised: boolean;
  overridden: boolean;
  override: { state: OverrideState; by: string; at: Date } | null;
  /** What the readings and records say, underneath any override. */
  computedState: ClearanceState;
}

/** A clear test clears a formulation for 12 months unless the production sets otherwise. */
export const DEFAULT_VALIDITY_MONTHS = 12;

/** Calendar months later in UTC, the day clamped to the month's end (31 Jan + 1 month = 28 or 29 Feb). */
export function addMonths(at: Date, months: number): Date {
  const d = new Date(at.getTime());
  const day = d.getUTCDate();
  d.setUTCDate(1);
  d.setUTCMonth(d.getUTCMonth() + months);
  const last = new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 0)).getUTCDate();
  d.setUTCDate(Math.min(day, last));
  return d;
}

/** What one tested product says on its own, whatever is asked: its graded codes in order and how far it got. */
export interface TestFacts {
  t: TestedProduct;
  codes: GradedCode[];
  start: number;
  finalAt: number | null;
  final: GradedCode | null;
  complete: boolean;
  finished: boolean;
  positive: boolean;
  allNegative: boolean;
  pending: boolean;
}

function factsOf(t: TestedProduct): TestFacts {
  const graded = t.readings.filter((r) => r.code !== 'NT').sort((a, b) => a.readAt.getTime() - b.readAt.getTime());
  const codes = graded.map((r) => r.code as GradedCode);
  const read = new Set(graded.map((r) => r.pointId));
  const complete = t.requiredPointIds.length > 0 && t.requiredPointIds.every((id) => read.has(id));
  const last = graded.at(-1);
  return {
    t,
    codes,
    start: t.appliedAt?.getTime() ?? graded[0]?.readAt.getTime() ?? Number.POSITIVE_INFINITY,
    finalAt: last?.readAt.getTime() ?? null,
    final: (last?.code as GradedCode | undefined) ?? null,
    complete,
    finished: complete || t.status === 'closed' || t.status === 'cancelled',
    positive: codes.some(isPositive),
    allNegative: codes.length > 0 && codes.every((c) => c === '-'),
    pending: !complete && (t.status === 'booked' || t.status === 'applied'),
  };
}

function reason(code: ClearanceReasonCode): ClearanceReason {
  return { code, text: CLEARANCE_REASON_TEXTS[code] };
}

/** What all the tests of one formulation say together: everything clearance asks of them but the date. */
interface FormulationTests {
  count: number;
  /** Any `+` or stronger. */
  positive: boolean;
  /** A clean run: complete and negative throughout. The latest one's final reading (ms), or null without one. */
  latestCleanFinalAt: number | null;
  /** In the tests a later clean run has not set aside (none positive): a doubtful final reading, any doubtful reading, any irritant one. */
  retestAdvised: boolean;
  doubtful: boolean;
  irritation: boolean;
  /** Readings outstanding on a test still booked, or applied. */
  booked: boolean;
  applied: boolean;
  /** A test that ended without every reading. */
  finishedIncomplete: boolean;
  /** When any reading was last made, not-tested ones included (-Infinity before the first). */
  lastReadAt: number;
}

const NO_TESTS: FormulationTests = Object.freeze({
  count: 0,
  positive: false,
  latestCleanFinalAt: null,
  retestAdvised: false,
  doubtful: false,
  irritation: false,
  booked: false,
  applied: false,
  finishedIncomplete: false,
  lastReadAt: Number.NEGATIVE_INFINITY,
});

function formulationTests(tests: readonly TestFacts[]): FormulationTests {
  // A doubtful or irritant result stands until a later complete test of the same formulation is negative throughout.
  const cleanRuns = tests.filter((x) => x.complete && x.allNegative);
  // No clean run started after it: at or after the latest clean run's start.
  const lastCleanStart = cleanRuns.reduce((m, c) => Math.max(m, c.start), Number.NEGATIVE_INFINITY);
  const standing = tests.filter((x) => !x.positive && x.start >= lastCleanStart);
  return {
    count: tests.length,
    positive: tests.some((x) => x.positive),
    // Every clean run has a final reading (it is complete and negative throughout).
    latestCleanFinalAt: cleanRuns.length > 0 ? cleanRuns.reduce((m, x) => Math.max(m, x.finalAt ?? 0), Number.NEGATIVE_INFINITY) : null,
    retestAdvised: standing.some((x) => x.finished && x.final === '?+'),
    doubtful: standing.some((x) => x.codes.includes('?+')),
    irritation: standing.some((x) => x.codes.includes('IR')),
    booked: tests.some((x) => x.pending && x.t.status === 'booked'),
    applied: tests.some((x) => x.pending && x.t.status === 'applied'),
    finishedIncomplete: tests.some((x) => x.finished && !x.complete),
    lastReadAt: tests.reduce((m, x) => x.t.readings.reduce((n, r) => Math.max(n, r.readAt.getTime()), m), Number.NEGATIVE_INFINITY),
  };
}

/** The part of clearance that depends on the tests alone: read-only, shared by every call given it. */
export interface PreparedTests {
  testsByFormulation: ReadonlyMap<string, FormulationTests>;
  testedProducts: ReadonlySet<string>;
}

/** What the tests of each formulation say, and the products tested: the tests' part of every answer. */
export function prepareTests(tests: readonly TestedProduct[]): PreparedTests {
  const facts = new Map<string, TestFacts[]>();
  const testedProducts = new Set<string>();
  for (const t of tests) {
    const list = facts.get(t.formulationId) ?? facts.set(t.formulationId, []).get(t.formulationId)!;
    list.push(factsOf(t));
    testedProducts.add(t.productId);
  }
  return { testsByFormulation: new Map([...facts].map(([id, list]) => [id, formulationTests(list)])), testedProducts };
}

interface Prepared extends PreparedTests {
  /** For each non-trivial ingredient key, the formulations that reacted and list it. */
  reactedByKey: Map<string, Set<string>>;
  overrides: Map<string, ClearanceOverride>;
  allergies: readonly DeclaredAllergy[];
  now: Date;
  months: number;
}

function prepare(input: PerformerClearanceInput): Prepared {
  const { testsByFormulation, testedProducts } = input.prepared ?? prepareTests(input.tests);
  const known = new Map<string, FormulationFacts>();
  for (const f of [...input.testedFormulations, ...input.formulations]) if (!known.has(f.formulationId)) known.set(f.formulationId, f);
  const reacted = [...testsByFormulation]
    .filter(([, tests]) => tests.positive)
    .flatMap(([id]) => (known.get(id)?.ingredients?.length ? [known.get(id)!] : []));
  const reactedByKey = new Map<string, Set<string>>();
  for (const g of reacted) {
    for (const r of g.ingredients ?? []) if (!r.trivial) (reactedByKey.get(r.key) ?? reactedByKey.set(r.key, new Set()).get(r.key)!).add(g.formulationId);
  }
  const overrides = new Map<string, ClearanceOverride>();
  for (const o of input.overrides) {
    const prev = overrides.get(o.formulationId);
    if (!prev || prev.at.getTime() < o.at.getTime()) overrides.set(o.formulationId, o);
  }
  return { testsByFormulation, testedProducts, reactedByKey, overrides, allergies: input.declaredAllergies, now: input.now, months: input.validityMonths ?? DEFAULT_VALIDITY_MONTHS };
}

function computed(f: FormulationFacts, p: Prepared): { state: ClearanceState; reasons: ClearanceReason[]; validUntil: Date | null; retestAdvised: boolean } {
  const tests = p.testsByFormulation.get(f.formulationId) ?? NO_TESTS;
  const ingredients = f.ingredients ?? [];
  const recorded = ingredients.length > 0;

  const stop: ClearanceReason[] = [];
  if (tests.positive) stop.push(reason('reacted'));
  if (ingredients.some((ing) => p.allergies.some((a) => matchesAllergy(ing, a)))) stop.push(reason('declared_allergy'));

  const retestAdvised = tests.retestAdvised;
  const caution: ClearanceReason[] = [];
  // A non-trivial ingredient that another formulation which reacted also lists (looked up by key, not pair by pair).
  const sharesReacted = ingredients.some((ing) => {
    const by = ing.trivial ? undefined : p.reactedByKey.get(ing.key);
    return by !== undefined && (by.size > 1 || !by.has(f.formulationId));
  });
  if (sharesReacted) {
    caution.push(reason('shared_ingredient'));
  }
  if (retestAdvised) caution.push(reason('doubtful_final'));
  else if (tests.doubtful) caution.push(reason('doubtful_reading'));
  if (tests.irritation) caution.push(reason('irritation'));

  const pending: ClearanceReason[] = [];
  if (tests.booked) pending.push(reason('test_booked'));
  if (tests.applied) pending.push(reason('readings_outstanding'));

  const validUntil = tests.latestCleanFinalAt !== null ? addMonths(new Date(tests.latestCleanFinalAt), p.months) : null;
  const valid = validUntil !== null && validUntil.getTime() > p.now.getTime();

  const base: ClearanceReason[] = [];
  if (tests.count === 0) base.push(reason(p.testedProducts.has(f.productId) ? 'new_formulation' : 'not_tested'));
  else if (tests.latestCleanFinalAt !== null && !valid) base.push(reason('last_test_expired'));
  else if (tests.latestCleanFinalAt === null && pending.length === 0 && caution.length === 0 && tests.finishedIncomplete) base.push(reason('test_incomplete'));
  const records = recorded ? [] : [reason('ingredients_not_recorded')];

  if (stop.length > 0) return { state: 'do_not_use', reasons: [...stop, ...records], validUntil: null, retestAdvised };
  if (caution.length > 0) return { state: 'caution', reasons: [...caution, ...pending, ...base, ...records], validUntil: null, retestAdvised };
  if (pending.length > 0) return { state: 'pending', reasons: [...pending, ...base, ...records], validUntil: null, retestAdvised };
  if (valid && recorded) return { state: 'cleared', reasons: [reason('no_reaction')], validUntil, retestAdvised };
  const why = [...base, ...records];
  return { state: 'untested', reasons: why.length > 0 ? why : [reason('not_tested')], validUntil: null, retestAdvised };
}

/**
 * Clearance of one formulation. Do not use: any `+` or stronger in a test of it, or a declared allergy to
 * an ingredient. Caution: a doubtful or irritant reading and nothing stronger, or a non-trivial ingredient
 * shared with another formulation that reacted. Pending: readings outstanding. Cleared: negative through
 * the final reading, for the validity period. Untested otherwise, and always while ingredients are unrecorded.
 * The lead's override wins until a later reading or its own end date sets it aside.
 */
function clearanceOf(f: FormulationFacts, p: Prepared): ClearanceResult {
  const c = computed(f, p);
  const o = p.overrides.get(f.formulationId);
  const readLater = o !== undefined && (p.testsByFormulation.get(f.formulationId) ?? NO_TESTS).lastReadAt > o.at.getTime();
  const ended = o?.expiresAt != null && o.expiresAt.getTime() <= p.now.getTime();
  // Each answer is written out field by field: spreading objects of several shapes here cost more than
  // everything else the rule does (measured on a 30-product check).
  if (o && !readLater && !ended) {
    return {
      productId: f.productId,
      formulationId: f.formulationId,
      productName: f.productName,
      state: o.state,
      reasons: [reason('lead_decision'), ...c.reasons],
      validUntil: o.state === 'cleared' ? (o.expiresAt ?? null) : null,
      retestAdvised: c.retestAdvised,
      overridden: true,
      override: { state: o.state, by: o.by, at: o.at },
      computedState: c.state,
    };
  }
  return {
    productId: f.productId,
    formulationId: f.formulationId,
    productName: f.productName,
    state: c.state,
    reasons: o ? [...c.reasons, reason('override_lapsed')] : c.reasons,
    validUntil: c.validUntil,
    retestAdvised: c.retestAdvised,
    overridden: false,
    override: null,
    computedState: c.state,
  };
}

/** A performer's clearance for every formulation asked about, in the order given, from one set of list queries. */
export function performerClearance(input: PerformerClearanceInput): ClearanceResult[] {
  const p = prepare(input);
  return input.formulations.map((f) => clearanceOf(f, p));
}

/** A performer's clearance for one formulation; for many, call `performerClearance` once instead. */
export function formulationClearance(formulation: FormulationFacts, input: Omit<PerformerClearanceInput, 'formulations'>): ClearanceResult {
  return performerClearance({ ...input, formulations: [formulation] })[0]!;
}
