import { describe, expect, it } from 'vitest';
import { SEED_INGREDIENTS, SEED_PRODUCTS } from '#api/db/seed-catalogue-data.ts';
import { lotExpired, PRODUCT_CATEGORIES } from '#shared/domain/catalogue.ts';
import { performerClearance, type FormulationFacts } from '#shared/domain/clearance.ts';
import { buildVocabulary, isValidCas, parseInciList, resolveIngredient, resolveIngredientList, sharedNonTrivialIngredients } from '#shared/domain/ingredients.ts';

const vocab = buildVocabulary(SEED_INGREDIENTS);
const current = (key: string) => {
  const p = SEED_PRODUCTS.find((x) => x.key === key)!;
  return p.formulations.at(-1)!;
};
const refs = (key: string) => resolveIngredientList(parseInciList(current(key).inciLabel!), vocab);

describe('the demo ingredient vocabulary', () => {
  it('gives every name to one ingredient only', () => {
    expect(vocab.conflicts).toEqual([]);
  });

  it('has well-formed CAS numbers wherever one is given', () => {
    // CAS Registry check-digit rule (from memory)
    const bad = SEED_INGREDIENTS.filter((i) => i.cas !== null && !isValidCas(i.cas)).map((i) => i.inci);
    expect(bad).toEqual([]);
  });

  it('knows rosin under all its names', () => {
    // BSCA leaflet (cutaneousallergy.org): colophonium / colophony / rosin / abietic acid / abietyl alcohol / gum rosin / tall oil / wood rosin
    for (const name of ['Colophony', 'Rosin', 'Abietic Acid', 'Abietyl Alcohol', 'Gum Rosin', 'Tall Oil', 'Wood Rosin']) {
      expect(resolveIngredient(name, vocab)?.inci, name).toBe('Colophonium');
    }
  });

  it('covers the substances of adhesives, removers and appliances', () => {
    // colophonium (Higgins 2013), 2-HEMA (BJD 2019;181:811), MI (EECDRG), formaldehyde
    // (Contact Dermatitis 2013;69:372), IPA (Contact Dermatitis 2011;65:101); accelerators, fragrance markers,
    // MCI/MI, silicones, epoxy, PPD, nickel, cobalt (from memory)
    const expected: [string, string][] = [
      ['Colophonium', 'rosin'],
      ['2-HEMA', 'acrylates'],
      ['Methyl Methacrylate', 'acrylates'],
      ['Latex', 'latex'],
      ['Thiram', 'rubber_accelerators'],
      ['MBT', 'rubber_accelerators'],
      ['IPPD', 'rubber_accelerators'],
      ['Fragrance', 'fragrance'],
      ['Cinnamal', 'fragrance'],
      ['Oakmoss', 'fragrance'],
      ['Balsam of Peru', 'fragrance'],
      ['Methylisothiazolinone', 'preservatives'],
      ['Methylchloroisothiazolinone', 'preservatives'],
      ['Formaldehyde', 'preservatives'],
      ['Isopropyl Alcohol', 'solvents'],
      ['Polydimethylsiloxane', 'silicones'],
      ['Epoxy Resin', 'other'],
      ['PPD', 'pigments'],
      ['Nickel Sulfate', 'other'],
      ['Cobalt Chloride', 'other'],
      ['CI 77491', 'pigments'],
    ];
    for (const [name, group] of expected) expect(resolveIngredient(name, vocab)?.group, name).toBe(group);
  });

  it('marks water and the other carriers trivial, and nothing that sensitises', () => {
    expect(resolveIngredient('Water', vocab)?.trivial).toBe(true);
    expect(resolveIngredient('Glycerin', vocab)?.trivial).toBe(true);
    for (const name of ['Propylene Glycol', 'Alcohol', 'Parfum', 'Colophonium', 'Isopropyl Myristate']) {
      expect(resolveIngredient(name, vocab)?.trivial, name).toBe(false);
    }
  });
});

describe('the demo catalogue', () => {
  it('has about fifteen products, each in a known category with a current formulation and a lot', () => {
    expect(SEED_PRODUCTS.length).toBeGreaterThanOrEqual(15);
    expect(new Set(SEED_PRODUCTS.map((p) => p.key)).size).toBe(SEED_PRODUCTS.length);
    for (const p of SEED_PRODUCTS) {
      expect(PRODUCT_CATEGORIES, p.key).toContain(p.category);
      expect(p.formulations.length, p.key).toBeGreaterThan(0);
      expect(p.lots.length, p.key).toBeGreaterThan(0);
      for (const lot of p.lots) expect(p.formulations.map((f) => f.version), lot.code).toContain(lot.formulationVersion);
    }
  });

  it('lists ingredients the vocabulary knows, apart from one deliberately unknown copolymer', () => {
    const unknown = SEED_PRODUCTS.flatMap((p) => p.formulations.flatMap((f) => (f.inciLabel ? parseInciList(f.inciLabel) : []))).filter((n) => !resolveIngredient(n, vocab));
    expect(unknown).toEqual(['Vinyl Chloride/Vinyl Acetate Copolymer']);
  });

  it('has exactly one product with no ingredients recorded', () => {
    expect(SEED_PRODUCTS.filter((p) => p.formulations.some((f) => f.inciLabel === null)).map((p) => p.key)).toEqual(['flotsam']);
  });

  it('has one lot expired by 2026-12-01 and the rest good through 2027 or 2028', () => {
    const on = new Date('2026-12-01T00:00:00Z');
    const lots = SEED_PRODUCTS.flatMap((p) => p.lots);
    expect(lots.filter((l) => lotExpired(l.expiresOn, on)).map((l) => l.code)).toEqual(['HB-2411']);
    for (const l of lots.filter((x) => !lotExpired(x.expiresOn, on))) expect(l.expiresOn, l.code).toMatch(/^202[78]-/);
  });

  it('has a product with a newer formulation', () => {
    expect(SEED_PRODUCTS.find((p) => p.key === 'harbour-bond')!.formulations.map((f) => f.version)).toEqual([1, 2]);
  });

  it('has products that share a non-trivial ingredient, and some that share only carriers', () => {
    expect(sharedNonTrivialIngredients(refs('quayside'), refs('breakwater')).map((r) => r.inci)).toEqual(['Acrylates Copolymer']);
    expect(sharedNonTrivialIngredients(refs('estuary'), refs('foghorn')).map((r) => r.inci)).toEqual(['Natural Rubber Latex', 'Ammonia']);
    expect(sharedNonTrivialIngredients(refs('quayside'), refs('tern'))).toEqual([]);
  });

  it('turns one reaction into Caution for a product sharing its ingredient, and leaves carrier-only neighbours alone', () => {
    const facts = (key: string): FormulationFacts => ({ formulationId: key, productId: key, productName: key, ingredients: refs(key) });
    const results = performerClearance({
      formulations: [facts('breakwater'), facts('tern')],
      testedFormulations: [facts('quayside')],
      tests: [
        {
          testId: 't1',
          productId: 'quayside',
          formulationId: 'quayside',
          status: 'closed',
          appliedAt: new Date('2026-09-07T09:00:00Z'),
          requiredPointIds: ['d2', 'd4'],
          readings: [
            { pointId: 'd2', code: '+', readAt: new Date('2026-09-09T09:30:00Z') },
            { pointId: 'd4', code: '++', readAt: new Date('2026-09-11T09:00:00Z') },
          ],
        },
      ],
      declaredAllergies: [],
      overrides: [],
      now: new Date('2026-12-01T00:00:00Z'),
    });
    expect(results.map((r) => [r.productId, r.state])).toEqual([
      ['breakwater', 'caution'],
      ['tern', 'untested'],
    ]);
  });
});

describe('lotExpired', () => {
  it('counts the expiry date as the last day of use', () => {
    expect(lotExpired('2026-11-30', new Date('2026-11-30T23:59:59Z'))).toBe(false);
    expect(lotExpired('2026-11-30', new Date('2026-12-01T00:00:00Z'))).toBe(true);
    expect(lotExpired(null, new Date('2030-01-01T00:00:00Z'))).toBe(false);
  });
});
