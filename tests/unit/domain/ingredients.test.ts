import { describe, expect, it } from 'vitest';
import {
  buildVocabulary,
  ingredientRef,
  isValidCas,
  matchesAllergy,
  normaliseInciName,
  parseInciLabel,
  parseInciList,
  resolveDeclaredAllergy,
  resolveIngredient,
  resolveIngredientList,
  sharedNonTrivialIngredients,
  type Ingredient,
} from '#shared/domain/ingredients.ts';

const VOCAB: Ingredient[] = [
  { inci: 'Aqua', synonyms: ['Water'], cas: '7732-18-5', group: 'other', trivial: true },
  { inci: 'Glycerin', synonyms: ['Glycerol'], cas: '56-81-5', group: 'other', trivial: true },
  // BSCA leaflet (cutaneousallergy.org): colophonium / colophony / rosin / abietic acid / abietyl alcohol / gum rosin / tall oil / wood rosin
  {
    inci: 'Colophonium',
    synonyms: ['Colophony', 'Rosin', 'Abietic Acid', 'Abietyl Alcohol', 'Gum Rosin', 'Tall Oil', 'Wood Rosin'],
    cas: '8050-09-7',
    group: 'rosin',
    trivial: false,
  },
  { inci: 'Parfum', synonyms: ['Fragrance'], cas: null, group: 'fragrance', trivial: false },
  { inci: 'Limonene', synonyms: [], cas: '5989-27-5', group: 'fragrance', trivial: false },
  { inci: 'Isopropyl Myristate', synonyms: ['IPM'], cas: '110-27-0', group: 'solvents', trivial: false },
  { inci: 'CI 77491', synonyms: ['Red Iron Oxide'], cas: '1309-37-1', group: 'pigments', trivial: false },
  { inci: 'CI 77891', synonyms: ['Titanium Dioxide'], cas: '13463-67-7', group: 'pigments', trivial: false },
  { inci: 'Acrylates Copolymer', synonyms: [], cas: null, group: 'acrylates', trivial: false },
  { inci: 'Natural Rubber Latex', synonyms: ['Latex'], cas: '9006-04-6', group: 'latex', trivial: false },
];
const vocab = buildVocabulary(VOCAB);

describe('normaliseInciName', () => {
  it('ignores case, spacing and punctuation', () => {
    expect(normaliseInciName('C.I. 77491')).toBe(normaliseInciName('CI77491'));
    expect(normaliseInciName('  isopropyl   MYRISTATE ')).toBe(normaliseInciName('Isopropyl Myristate'));
    expect(normaliseInciName('Acrylates Co-polymer')).toBe(normaliseInciName('Acrylates Copolymer'));
  });
  it('reads a nanomaterial marker as the same substance', () => {
    // EU Reg. 1223/2009 Art. 19: nanomaterials followed by "(nano)" (from memory)
    expect(normaliseInciName('Titanium Dioxide (nano)')).toBe(normaliseInciName('Titanium Dioxide'));
  });
  it('folds accents', () => {
    expect(normaliseInciName('Colophône')).toBe(normaliseInciName('colophone'));
  });
});

describe('isValidCas', () => {
  it('checks the CAS check digit', () => {
    // CAS Registry check-digit rule and its worked example, water 7732-18-5 (from memory)
    expect(isValidCas('7732-18-5')).toBe(true);
    expect(isValidCas('7732-18-4')).toBe(false);
    // formaldehyde 50-00-0 and rosin 8050-09-7 (from memory)
    expect(isValidCas('50-00-0')).toBe(true);
    expect(isValidCas('8050-09-7')).toBe(true);
  });
  it('refuses anything not shaped like a CAS number', () => {
    expect(isValidCas('7732185')).toBe(false);
    expect(isValidCas('1-18-5')).toBe(false);
    expect(isValidCas('')).toBe(false);
  });
});

describe('resolveIngredient', () => {
  it('finds rosin under every one of its names', () => {
    // BSCA leaflet (cutaneousallergy.org) synonym list for rosin
    for (const name of ['colophonium', 'Colophony', 'ROSIN', 'abietic acid', 'Abietyl Alcohol', 'gum rosin', 'tall oil', 'Wood Rosin']) {
      expect(resolveIngredient(name, vocab)?.inci, name).toBe('Colophonium');
    }
  });
  it('reads bracketed and slash-joined names and CAS numbers', () => {
    expect(resolveIngredient('Parfum (Fragrance)', vocab)?.inci).toBe('Parfum');
    expect(resolveIngredient('Aqua/Water/Eau', vocab)?.inci).toBe('Aqua');
    expect(resolveIngredient('C.I. 77491', vocab)?.inci).toBe('CI 77491');
    expect(resolveIngredient('8050-09-7', vocab)?.inci).toBe('Colophonium');
  });
  it('never resolves a copolymer to one of its monomers', () => {
    const v = buildVocabulary([...VOCAB, { inci: 'Vinyl Acetate', synonyms: [], cas: '108-05-4', group: 'other', trivial: false }]);
    expect(resolveIngredient('Vinyl Chloride/Vinyl Acetate Copolymer', v)).toBeNull();
  });
  it('answers null for an unknown name', () => {
    expect(resolveIngredient('Unobtainium', vocab)).toBeNull();
  });
});

describe('buildVocabulary', () => {
  it('reports a name claimed by two ingredients and keeps the first', () => {
    const v = buildVocabulary([...VOCAB, { inci: 'Balsam Resin', synonyms: ['Rosin'], cas: null, group: 'other', trivial: false }]);
    expect(v.conflicts).toEqual([{ key: 'rosin', claimedBy: ['Colophonium', 'Balsam Resin'] }]);
    expect(resolveIngredient('rosin', v)?.inci).toBe('Colophonium');
  });
});

describe('parseInciList', () => {
  it('drops the word "Ingredients" and keeps label order', () => {
    // EU Reg. 1223/2009 Art. 19(1)(g) (lexoraeu.com; AGES): the list starts with "Ingredients", descending order of weight
    expect(parseInciList('Ingredients: Aqua, Isopropyl Myristate, Glycerin, Parfum, Limonene.')).toEqual(['Aqua', 'Isopropyl Myristate', 'Glycerin', 'Parfum', 'Limonene']);
    expect(parseInciList('INGREDIENTS : Aqua; Glycerin')).toEqual(['Aqua', 'Glycerin']);
  });
  it('marks the colourants after "may contain" or "+/-"', () => {
    // EU Reg. 1223/2009 Art. 19 (AGES; lexoraeu.com): colourants as CI numbers; shade ranges may use "may contain" / "±"
    expect(parseInciLabel('Ingredients: Talc, Mica. May contain (+/-): CI 77491, CI 77891.')).toEqual([
      { name: 'Talc', mayContain: false },
      { name: 'Mica', mayContain: false },
      { name: 'CI 77491', mayContain: true },
      { name: 'CI 77891', mayContain: true },
    ]);
    expect(parseInciLabel('Talc, Mica [+/- CI 77491, CI 77891], Tocopherol').map((e) => `${e.name}:${e.mayContain}`)).toEqual([
      'Talc:false',
      'Mica:false',
      'CI 77491:true',
      'CI 77891:true',
      'Tocopherol:false',
    ]);
  });
  it('keeps commas inside brackets and between digits, and abbreviations', () => {
    expect(parseInciList('Ingredients: Parfum (Fragrance, Aroma), 1,2-Hexanediol, Alcohol Denat.')).toEqual(['Parfum (Fragrance, Aroma)', '1,2-Hexanediol', 'Alcohol Denat.']);
  });
  it('strips footnote marks and a closing footnote', () => {
    expect(parseInciList('Ingredients: Isopropyl Myristate, Limonene*, Linalool*. *Fragrance allergen')).toEqual(['Isopropyl Myristate', 'Limonene', 'Linalool']);
  });
  it('gives nothing for an empty list', () => {
    expect(parseInciList('Ingredients:')).toEqual([]);
  });
});

describe('sharedNonTrivialIngredients', () => {
  const refs = (names: string[]) => resolveIngredientList(names, vocab);

  it('finds an allergen two products share', () => {
    const a = refs(['Aqua', 'Acrylates Copolymer', 'Glycerin']);
    const b = refs(['Water', 'Acrylates Copolymer']);
    expect(sharedNonTrivialIngredients(a, b).map((r) => r.inci)).toEqual(['Acrylates Copolymer']);
  });
  it('never counts a trivial carrier as shared', () => {
    // common practice, no published source: water and glycerin are carriers
    expect(sharedNonTrivialIngredients(refs(['Aqua', 'Glycerin', 'Limonene']), refs(['Water', 'Glycerol', 'Colophony']))).toEqual([]);
  });
  it('matches names across synonyms', () => {
    expect(sharedNonTrivialIngredients(refs(['Rosin']), refs(['Colophonium'])).map((r) => r.inci)).toEqual(['Colophonium']);
  });
  it('still matches two identical unknown names, and treats them as not trivial', () => {
    const shared = sharedNonTrivialIngredients(refs(['Mystery Resin 7']), refs(['mystery resin-7']));
    expect(shared).toHaveLength(1);
    expect(shared[0]).toMatchObject({ inci: null, trivial: false, group: null });
  });
  it('lists each ingredient once', () => {
    expect(resolveIngredientList(['Rosin', 'Colophony', 'Aqua'], vocab).map((r) => r.inci)).toEqual(['Colophonium', 'Aqua']);
  });
});

describe('declared allergies', () => {
  it('links a family word to its group, and a substance to its ingredient', () => {
    expect(resolveDeclaredAllergy('fragrance', vocab)).toEqual({ kind: 'group', group: 'fragrance' });
    expect(resolveDeclaredAllergy('Latex', vocab)).toEqual({ kind: 'group', group: 'latex' });
    expect(resolveDeclaredAllergy('limonene', vocab)).toEqual({ kind: 'ingredient', key: 'limonene', name: 'Limonene' });
    expect(resolveDeclaredAllergy('other', vocab)).toBeNull();
    expect(resolveDeclaredAllergy('moonlight', vocab)).toBeNull();
  });
  it('matches an ingredient by group or by identity, carriers included', () => {
    const limonene = ingredientRef('Limonene', vocab);
    expect(matchesAllergy(limonene, { kind: 'group', group: 'fragrance' })).toBe(true);
    expect(matchesAllergy(limonene, { kind: 'group', group: 'rosin' })).toBe(false);
    const glycerin = ingredientRef('Glycerol', vocab);
    expect(matchesAllergy(glycerin, { kind: 'ingredient', key: 'glycerin', name: 'Glycerin' })).toBe(true);
  });
});
