import { describe, expect, it } from 'vitest';
import {
  addMonths,
  CLEARANCE_REASON_TEXTS,
  CLEARANCE_STATE_ICONS,
  CLEARANCE_STATE_LABELS,
  CLEARANCE_STATES,
  formulationClearance,
  performerClearance,
  prepareTests,
  type ClearanceOverride,
  type ClearanceResult,
  type FormulationFacts,
  type PerformerClearanceInput,
  type TestedProduct,
} from '#shared/domain/clearance.ts';
import type { IcdrgCode } from '#shared/domain/icdrg.ts';
import { buildVocabulary, resolveIngredientList, type DeclaredAllergy, type Ingredient } from '#shared/domain/ingredients.ts';
import { DEFAULT_PROTOCOLS, requiredPointIds } from '#shared/domain/protocols.ts';

const VOCAB: Ingredient[] = [
  { inci: 'Aqua', synonyms: ['Water'], cas: '7732-18-5', group: 'other', trivial: true },
  { inci: 'Glycerin', synonyms: [], cas: '56-81-5', group: 'other', trivial: true },
  { inci: 'Acrylates Copolymer', synonyms: [], cas: null, group: 'acrylates', trivial: false },
  { inci: 'Colophonium', synonyms: ['Rosin'], cas: '8050-09-7', group: 'rosin', trivial: false },
  { inci: 'Limonene', synonyms: [], cas: '5989-27-5', group: 'fragrance', trivial: false },
  { inci: 'Isopropyl Myristate', synonyms: [], cas: '110-27-0', group: 'solvents', trivial: false },
  { inci: 'Dimethicone', synonyms: [], cas: '9006-65-9', group: 'silicones', trivial: false },
];
const vocab = buildVocabulary(VOCAB);

const occluded = DEFAULT_PROTOCOLS.find((p) => p.id === 'occluded-48h')!;
const REQUIRED = requiredPointIds(occluded);
const d = (iso: string) => new Date(iso);
const NOW = d('2026-12-01T12:00:00Z');
const APPLIED = d('2026-09-07T09:00:00Z');
const READ_AT: Record<string, Date> = { d2: d('2026-09-09T09:30:00Z'), d4: d('2026-09-11T09:00:00Z'), d7: d('2026-09-14T09:00:00Z') };

function formulation(id: string, productId: string, names: string[] | null): FormulationFacts {
  return { formulationId: id, productId, productName: `Product ${productId}`, ingredients: names && resolveIngredientList(names, vocab) };
}

function tested(formulationId: string, productId: string, codes: Partial<Record<'d2' | 'd4' | 'd7', IcdrgCode>>, over: Partial<TestedProduct> = {}): TestedProduct {
  const shift = (over.appliedAt?.getTime() ?? APPLIED.getTime()) - APPLIED.getTime();
  return {
    testId: `t-${formulationId}-${Object.values(codes).join('')}-${shift}`,
    productId,
    formulationId,
    status: 'applied',
    appliedAt: APPLIED,
    requiredPointIds: REQUIRED,
    readings: Object.entries(codes).map(([pointId, code]) => ({ pointId, code: code!, readAt: new Date(READ_AT[pointId]!.getTime() + shift) })),
    ...over,
  };
}

const A = formulation('fa', 'pa', ['Aqua', 'Acrylates Copolymer', 'Glycerin']);
const B = formulation('fb', 'pb', ['Water', 'Acrylates Copolymer']);
const C = formulation('fc', 'pc', ['Aqua', 'Glycerin', 'Isopropyl Myristate']);
const R = formulation('fr', 'pr', ['Colophonium', 'Limonene']);
const EMPTY = formulation('fe', 'pe', null);

function run(over: Partial<PerformerClearanceInput> & { formulations?: FormulationFacts[] }): ClearanceResult[] {
  const formulations = over.formulations ?? [A];
  const input: PerformerClearanceInput = { testedFormulations: formulations, tests: [], declaredAllergies: [], overrides: [], now: NOW, ...over, formulations };
  const results = performerClearance(input);
  // Every case also runs with the tests' part worked out beforehand, as a caller that keeps it passes it.
  expect(performerClearance({ ...input, prepared: prepareTests(input.tests) })).toEqual(results);
  return results;
}
const one = (over: Partial<PerformerClearanceInput> & { formulations?: FormulationFacts[] }) => run(over)[0]!;
const codes = (r: ClearanceResult) => r.reasons.map((x) => x.code);

describe('states, labels and icons', () => {
  it('names the five states and gives each its own icon', () => {
    expect(CLEARANCE_STATES.map((s) => CLEARANCE_STATE_LABELS[s])).toEqual(['Cleared', 'Caution', 'Do not use', 'Pending', 'Untested']);
    expect(new Set(Object.values(CLEARANCE_STATE_ICONS)).size).toBe(5);
  });
  it('words every reason without grades or medical terms', () => {
    for (const text of Object.values(CLEARANCE_REASON_TEXTS)) {
      expect(text).not.toMatch(/[+?]|\bIR\b|\bNT\b|allerg(ic|en)\b|positive|negative|dermatitis|erythema/i);
    }
  });
});

describe('Do not use', () => {
  it('follows any weak, strong or extreme positive', () => {
    // Environ Health 2003;2:3 T1: + needs infiltration and is the first positive grade
    for (const code of ['+', '++', '+++'] as const) {
      const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: code })] });
      expect(r.state, code).toBe('do_not_use');
      expect(codes(r)).toEqual(['reacted']);
    }
  });
  it('follows a reaction first seen at D4 after a clear D2', () => {
    // Contact Dermatitis 1991;24:119-22: 24 % of allergic reactions negative at D2, positive at D4
    expect(one({ tests: [tested('fa', 'pa', { d2: '-', d4: '+' })] }).state).toBe('do_not_use');
  });
  it('follows a reaction at the optional D7 reading', () => {
    // Higgins & Collins, Dermatitis 2013;24(5): 12.8 % of patients had new positives at D7
    expect(one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-', d7: '+' })] }).state).toBe('do_not_use');
  });
  it('holds at once, before the remaining readings, and after a cancelled test', () => {
    expect(one({ tests: [tested('fa', 'pa', { d2: '++' })] }).state).toBe('do_not_use');
    expect(one({ tests: [tested('fa', 'pa', { d2: '+' }, { status: 'cancelled' })] }).state).toBe('do_not_use');
  });
  it('is not undone by a later clear test', () => {
    const later = d('2026-10-05T09:00:00Z');
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '+' }), tested('fa', 'pa', { d2: '-', d4: '-' }, { appliedAt: later })] });
    expect(r.state).toBe('do_not_use');
  });
  it('follows a declared allergy to an ingredient, with no test at all', () => {
    // common practice, no published source: a declared allergy to an ingredient means Do not use, tested or not
    const allergy: DeclaredAllergy = { kind: 'ingredient', key: 'colophonium', name: 'Colophonium' };
    const r = one({ formulations: [R], declaredAllergies: [allergy] });
    expect(r.state).toBe('do_not_use');
    expect(codes(r)).toEqual(['declared_allergy']);
  });
  it('follows a declared allergy to a whole group', () => {
    // common practice, no published source: an allergy declared to a group (e.g. acrylates) covers each of its ingredients
    expect(one({ formulations: [R], declaredAllergies: [{ kind: 'group', group: 'fragrance' }] }).state).toBe('do_not_use');
    expect(one({ formulations: [C], declaredAllergies: [{ kind: 'group', group: 'fragrance' }] }).state).toBe('untested');
  });
  it('follows a declared allergy even to a carrier', () => {
    // common practice, no published source: the performer's own word outranks the carrier flag
    expect(one({ formulations: [C], declaredAllergies: [{ kind: 'ingredient', key: 'glycerin', name: 'Glycerin' }] }).state).toBe('do_not_use');
  });
});

describe('Caution', () => {
  it('follows an irritant reading', () => {
    // Khanna, Illustrated Synopsis of Dermatology (stethoprep.com): IR, erythema without infiltration limited to the patch
    const r = one({ tests: [tested('fa', 'pa', { d2: 'IR', d4: '-' })] });
    expect(r.state).toBe('caution');
    expect(codes(r)).toEqual(['irritation']);
    expect(r.retestAdvised).toBe(false);
  });
  it('follows a doubtful reading along the way', () => {
    // Environ Health 2003;2:3 T1: ?+ is doubtful, faint erythema only, not positive
    const r = one({ tests: [tested('fa', 'pa', { d2: '?+', d4: '-' })] });
    expect(r.state).toBe('caution');
    expect(codes(r)).toEqual(['doubtful_reading']);
    expect(r.retestAdvised).toBe(false);
  });
  it('advises a retest after a doubtful final reading', () => {
    // readers place the ?+/+ threshold inconsistently (discovery.researcher.life abstract); advising a retest is common practice, no published source
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '?+' })] });
    expect(r.state).toBe('caution');
    expect(r.retestAdvised).toBe(true);
    expect(r.reasons[0]).toEqual({ code: 'doubtful_final', text: 'doubtful reading at the final check; retest advised' });
  });
  it('is settled by a later test that stays clear through its final reading', () => {
    const later = d('2026-10-05T09:00:00Z');
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '?+' }), tested('fa', 'pa', { d2: '-', d4: '-' }, { appliedAt: later })] });
    expect(r.state).toBe('cleared');
    expect(r.retestAdvised).toBe(false);
  });
  it('is not settled by a clear test that came before the doubtful one', () => {
    const later = d('2026-10-05T09:00:00Z');
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' }), tested('fa', 'pa', { d2: '?+', d4: '-' }, { appliedAt: later })] });
    expect(r.state).toBe('caution');
    expect(codes(r)).toEqual(['doubtful_reading']);
  });
  it('follows a non-trivial ingredient shared with a product that reacted', () => {
    // common practice, no published source: a shared non-trivial ingredient with a + or stronger product is a Caution
    const [b, c] = run({ formulations: [B, C], testedFormulations: [A], tests: [tested('fa', 'pa', { d2: '+', d4: '++' })] });
    expect(b!.state).toBe('caution');
    expect(codes(b!)).toEqual(['shared_ingredient', 'not_tested']);
    // C shares only water and glycerin with A: carriers never count
    expect(c!.state).toBe('untested');
  });
  it('overrides a clear test of its own when another product that reacted shares an ingredient', () => {
    // common practice, no published source: the shared-ingredient warning stands over the product's own clear test
    const r = one({ formulations: [B], testedFormulations: [A], tests: [tested('fb', 'pb', { d2: '-', d4: '-' }), tested('fa', 'pa', { d2: '+', d4: '+' })] });
    expect(r.state).toBe('caution');
    expect(r.validUntil).toBeNull();
  });
  it('comes before Pending', () => {
    const r = one({ tests: [tested('fa', 'pa', { d2: '?+' })] });
    expect(r.state).toBe('caution');
    expect(codes(r)).toEqual(['doubtful_reading', 'readings_outstanding']);
  });
});

describe('Pending', () => {
  it('holds while required readings are outstanding', () => {
    // Contact Dermatitis 1991;24:119-22 and the IVDK figures: readings after D2 find reactions D2 missed, so nothing clears before the last required reading
    const r = one({ tests: [tested('fa', 'pa', { d2: '-' })] });
    expect(r.state).toBe('pending');
    expect(codes(r)).toEqual(['readings_outstanding']);
  });
  it('holds for a booked test not yet applied', () => {
    // common practice, no published source: a booked test is Pending, not Untested, so nobody applies the product meanwhile
    const r = one({ tests: [tested('fa', 'pa', {}, { status: 'booked', appliedAt: null })] });
    expect(r.state).toBe('pending');
    expect(codes(r)).toEqual(['test_booked']);
  });
  it('does not wait for the optional D7 reading', () => {
    // ESCD 2015: D7 recommended, not required (from memory)
    expect(one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' })] }).state).toBe('cleared');
  });
  it('holds over an earlier clearance while a retest is under reading', () => {
    const later = d('2026-11-28T09:00:00Z');
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' }), tested('fa', 'pa', {}, { appliedAt: later })] });
    expect(r.state).toBe('pending');
  });
});

describe('Cleared and its validity', () => {
  it('needs a clear reading through the final one, and lasts 12 months from it', () => {
    // common practice, no published source: Plinth's default validity of 12 months
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' })] });
    expect(r.state).toBe('cleared');
    expect(codes(r)).toEqual(['no_reaction']);
    expect(r.validUntil).toEqual(d('2027-09-11T09:00:00Z'));
  });
  it('counts from the optional D7 when it was taken', () => {
    expect(one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-', d7: '-' })] }).validUntil).toEqual(d('2027-09-14T09:00:00Z'));
  });
  it('becomes Untested when the last test has expired', () => {
    // common practice, no published source: a result past its validity period counts as no test
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' })], now: d('2027-09-11T09:00:00Z') });
    expect(r.state).toBe('untested');
    expect(r.reasons).toEqual([{ code: 'last_test_expired', text: 'last test expired' }]);
  });
  it('takes the validity period per call', () => {
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' })], validityMonths: 2 });
    expect(r.state).toBe('untested');
    expect(codes(r)).toEqual(['last_test_expired']);
  });
  it('needs every required reading: a closed test missing D4, or with D4 not tested, does not clear', () => {
    expect(codes(one({ tests: [tested('fa', 'pa', { d2: '-' }, { status: 'closed' })] }))).toEqual(['test_incomplete']);
    const nt = one({ tests: [tested('fa', 'pa', { d2: '-', d4: 'NT' }, { status: 'closed' })] });
    expect(nt.state).toBe('untested');
  });
  it('survives a new lot of the same formulation', () => {
    // common practice, no published source: a lot is the same recipe made again, so its clearance carries over
    const r = one({ tests: [tested('fa', 'pa', { d2: '-', d4: '-' }, { lotId: 'lot-old' })] });
    expect(r.state).toBe('cleared');
  });
});

describe('Untested', () => {
  it('when there is no test', () => {
    // common practice, no published source: no test on record is Untested, never Cleared
    expect(one({}).reasons).toEqual([{ code: 'not_tested', text: 'not tested' }]);
  });
  it('again for a new formulation of a tested product', () => {
    // common practice, no published source: a changed recipe is a different product to the skin, so it is untested again
    const v2 = formulation('fa2', 'pa', ['Aqua', 'Acrylates Copolymer', 'Dimethicone']);
    const r = one({ formulations: [v2], testedFormulations: [A], tests: [tested('fa', 'pa', { d2: '-', d4: '-' })] });
    expect(r.state).toBe('untested');
    expect(codes(r)).toEqual(['new_formulation']);
  });
  it('with Caution for a new formulation sharing an ingredient with the old one that reacted', () => {
    const v2 = formulation('fa2', 'pa', ['Aqua', 'Acrylates Copolymer', 'Dimethicone']);
    const r = one({ formulations: [v2], testedFormulations: [A], tests: [tested('fa', 'pa', { d2: '+', d4: '+' })] });
    expect(r.state).toBe('caution');
    expect(codes(r)).toEqual(['shared_ingredient', 'new_formulation']);
  });
  it('while ingredients are not recorded, even after a clear test', () => {
    const r = one({ formulations: [EMPTY], tests: [tested('fe', 'pe', { d2: '-', d4: '-' })] });
    expect(r.state).toBe('untested');
    expect(r.reasons).toEqual([{ code: 'ingredients_not_recorded', text: 'ingredients not recorded' }]);
    expect(codes(one({ formulations: [EMPTY] }))).toEqual(['not_tested', 'ingredients_not_recorded']);
    expect(one({ formulations: [{ ...EMPTY, ingredients: [] }] }).state).toBe('untested');
  });
  it('but a reaction still means Do not use without ingredients', () => {
    expect(one({ formulations: [EMPTY], tests: [tested('fe', 'pe', { d2: '+' })] }).state).toBe('do_not_use');
  });
});

// common practice, no published source: a designated lead's judgement, noted and audited, stands over the computed state
describe("the lead's override", () => {
  const cautionTest = tested('fa', 'pa', { d2: 'IR', d4: '-' });
  const override: ClearanceOverride = { formulationId: 'fa', state: 'cleared', by: 'Designated lead', at: d('2026-10-01T10:00:00Z'), note: 'Seen by the production dermatologist.' };

  it('sets the state, shows who and when, and keeps the computed state underneath', () => {
    const r = one({ tests: [cautionTest], overrides: [override] });
    expect(r).toMatchObject({ state: 'cleared', overridden: true, computedState: 'caution', override: { state: 'cleared', by: 'Designated lead', at: override.at } });
    expect(codes(r)).toEqual(['lead_decision', 'irritation']);
  });
  it('never carries the note', () => {
    const r = one({ tests: [cautionTest], overrides: [override] });
    expect(JSON.stringify(r)).not.toContain('dermatologist');
  });
  it('takes the latest override for a formulation', () => {
    const later = { ...override, state: 'do_not_use' as const, at: d('2026-10-02T10:00:00Z') };
    expect(one({ tests: [cautionTest], overrides: [later, override] }).state).toBe('do_not_use');
  });
  it('is set aside by a reading recorded after it', () => {
    const r = one({ tests: [cautionTest], overrides: [{ ...override, at: d('2026-09-10T10:00:00Z') }] });
    expect(r).toMatchObject({ state: 'caution', overridden: false, override: null });
    expect(codes(r)).toContain('override_lapsed');
  });
  it('is set aside at its own end date', () => {
    const r = one({ tests: [cautionTest], overrides: [{ ...override, expiresAt: d('2026-11-30T00:00:00Z') }] });
    expect(r.state).toBe('caution');
  });
  it('belongs to one formulation only', () => {
    expect(one({ formulations: [B], overrides: [override] }).overridden).toBe(false);
  });
});

describe('what the result shows', () => {
  it('carries no grade, pattern or reading of any kind', () => {
    const [r] = run({ tests: [tested('fa', 'pa', { d2: '?+', d4: '++' })] });
    const text = JSON.stringify(r);
    for (const leak of ['"+', '?+', '++', 'IR', 'd2', 'd4', 'readAt', 'code":"+']) expect(text).not.toContain(leak);
  });
});

describe('performerClearance', () => {
  it('answers every formulation in one call, in the order asked', () => {
    const tests = [tested('fa', 'pa', { d2: '+', d4: '+' }), tested('fc', 'pc', { d2: '-', d4: '-' }), tested('fr', 'pr', { d2: '-' })];
    const results = run({ formulations: [R, C, B, A, EMPTY], tests });
    expect(results.map((r) => [r.formulationId, r.state])).toEqual([
      ['fr', 'pending'],
      ['fc', 'cleared'],
      ['fb', 'caution'],
      ['fa', 'do_not_use'],
      ['fe', 'untested'],
    ]);
  });
  it('agrees with the one-formulation form', () => {
    const tests = [tested('fa', 'pa', { d2: '+', d4: '+' })];
    const input = { testedFormulations: [A], tests, declaredAllergies: [], overrides: [], now: NOW };
    expect(formulationClearance(B, input)).toEqual(performerClearance({ ...input, formulations: [B] })[0]);
  });
});

describe('addMonths', () => {
  it('keeps the day of the month, clamped at the month end', () => {
    expect(addMonths(d('2026-09-11T09:00:00Z'), 12)).toEqual(d('2027-09-11T09:00:00Z'));
    expect(addMonths(d('2027-01-31T00:00:00Z'), 1)).toEqual(d('2027-02-28T00:00:00Z'));
    // 2028 is a leap year; 2029 is not
    expect(addMonths(d('2028-02-29T12:00:00Z'), 12)).toEqual(d('2029-02-28T12:00:00Z'));
  });
});
