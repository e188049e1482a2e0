import { describe, expect, it } from 'vitest';
import { classifyArchiveQuery, matchesTerms, normaliseSearchText } from '#shared/domain/archive-search.ts';
import { labelCodeFromNumber, labelUrl } from '#shared/domain/label-codes.ts';

describe('classifyArchiveQuery', () => {
  const cast = labelCodeFromNumber('cast', 123_456);
  const place = labelCodeFromNumber('location', 654_321);

  it('nothing typed is an empty query', () => {
    expect(classifyArchiveQuery('   ')).toEqual({ kind: 'empty' });
  });
  it('a label code, typed or scanned as a URL, opens that record', () => {
    expect(classifyArchiveQuery(cast.toLowerCase())).toEqual({ kind: 'label', target: 'cast', code: cast });
    expect(classifyArchiveQuery(cast.replace('-', ''))).toEqual({ kind: 'label', target: 'cast', code: cast });
    expect(classifyArchiveQuery(labelUrl('https://plinth.example.test', place))).toEqual({ kind: 'label', target: 'location', code: place });
  });
  it('a hyphened code that fails its check is reported as misread, not searched as words', () => {
    const last = cast.slice(-1) === 'Z' ? 'Y' : 'Z';
    const r = classifyArchiveQuery(cast.slice(0, -1) + last);
    expect(r.kind).toBe('bad_label');
  });
  it('a scanned label from another site is refused when the origin is known', () => {
    const r = classifyArchiveQuery(labelUrl('https://elsewhere.example.test', cast), { origin: 'https://plinth.example.test' });
    expect(r).toEqual({ kind: 'bad_label', message: 'This label was printed for a different site.' });
  });
  it('a word that happens to start with C or L stays a word', () => {
    expect(classifyArchiveQuery('casting')).toEqual({ kind: 'text', text: 'casting', terms: ['casting'] });
    expect(classifyArchiveQuery('LEFTARM')).toMatchObject({ kind: 'text' });
  });
  it('a location code path is looked up as a place', () => {
    expect(classifyArchiveQuery(' qs / north/r2 ')).toMatchObject({ kind: 'code_path', path: 'QS/NORTH/R2' });
    expect(classifyArchiveQuery('face/hand cast')).toMatchObject({ kind: 'text' });
    // "face/hand" could be either; the words travel along for when no place has that path.
    expect(classifyArchiveQuery('Face/Hand')).toEqual({ kind: 'code_path', path: 'FACE/HAND', text: 'face/hand', terms: ['face/hand'] });
  });
  it('anything else is words, normalised for matching', () => {
    expect(classifyArchiveQuery('  Juno   FACE face ')).toEqual({ kind: 'text', text: 'juno face face', terms: ['juno', 'face'] });
  });
});

describe('matching words', () => {
  it('ignores case and accents', () => {
    expect(normaliseSearchText('  Renée  Ødegård ')).toBe('renee ødegard');
    expect(matchesTerms(['Renée Castellane', 'Face'], ['renee'])).toBe(true);
  });
  it('every word must match some field', () => {
    const fields = ['Juno Castellane', 'The Lantern Keeper', 'Face', 'Mold', null];
    expect(matchesTerms(fields, ['juno', 'mold'])).toBe(true);
    expect(matchesTerms(fields, ['juno', 'hand'])).toBe(false);
    expect(matchesTerms(fields, [])).toBe(true);
  });
});
