import { describe, expect, it } from 'vitest';
import { declaredAllergiesFromAnswers } from '#shared/domain/declared-allergies.ts';
import { buildVocabulary, type Ingredient } from '#shared/domain/ingredients.ts';

// INCI names as in the EU cosmetic ingredient glossary (check-values.md §2); groups and the carrier flag are Plinth's.
const VOCAB = buildVocabulary([
  { inci: 'Colophonium', synonyms: ['Rosin', 'Colophony'], cas: '8050-09-7', group: 'rosin', trivial: false },
  { inci: 'Aqua', synonyms: ['Water'], cas: '7732-18-5', group: 'other', trivial: true },
  { inci: 'Methylisothiazolinone', synonyms: ['MI'], cas: '2682-20-4', group: 'preservatives', trivial: false },
] satisfies Ingredient[]);

describe('declaredAllergiesFromAnswers', () => {
  it('reads groups and ingredients out of a performer’s own sentence', () => {
    const out = declaredAllergiesFromAnswers(['I am allergic to latex, colophony and fragrance; sticking plasters itch'], VOCAB);
    expect(out).toEqual([
      { kind: 'group', group: 'latex' },
      { kind: 'ingredient', key: 'colophonium', name: 'Colophonium' },
      { kind: 'group', group: 'fragrance' },
    ]);
  });
  it('finds a name inside a longer phrase', () => {
    expect(declaredAllergiesFromAnswers(['my skin reacts badly to latex gloves'], VOCAB)).toEqual([{ kind: 'group', group: 'latex' }]);
  });
  it('declares nothing for "none", blanks, or words the vocabulary lacks', () => {
    expect(declaredAllergiesFromAnswers(['None', 'n/a', '  ', 'Sticking plasters make my skin itch'], VOCAB)).toEqual([]);
  });
  it('counts a carrier only when named on its own', () => {
    expect(declaredAllergiesFromAnswers(['water-based paints are fine with me'], VOCAB)).toEqual([]);
    expect(declaredAllergiesFromAnswers(['Water'], VOCAB)).toEqual([{ kind: 'ingredient', key: 'aqua', name: 'Aqua' }]);
  });
  it('lists each allergy once across answers', () => {
    expect(declaredAllergiesFromAnswers(['MI', 'methylisothiazolinone'], VOCAB)).toEqual([{ kind: 'ingredient', key: 'methylisothiazolinone', name: 'Methylisothiazolinone' }]);
  });
});
