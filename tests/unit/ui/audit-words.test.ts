import { describe, expect, it } from 'vitest';
import { detailWords, humanize, recordWords } from '#app/features/audit/components/audit-words.ts';

// Plinth's own wording rules for the audit page (no outside source: the words are the product's).
describe('audit words', () => {
  it('turns codes and keys into words', () => {
    expect(recordWords('signing_request')).toBe('Signing request');
    expect(recordWords('something_new')).toBe('Something new');
    expect(humanize('emailConfirmed')).toBe('Email confirmed');
    expect(humanize('validity_days')).toBe('Validity days');
  });

  it('words values and leaves bare ids out', () => {
    expect(detailWords(true)).toBe('Yes');
    expect(detailWords('email_bound_to_other_subject')).toBe('Email bound to other subject');
    expect(detailWords('Reacted to a remover')).toBe('Reacted to a remover');
    expect(detailWords('0b9e6c1a-3f1e-4c2a-9d7e-1a2b3c4d5e6f')).toBeNull();
    expect(detailWords({ before: 'a@x.test', after: 'b@x.test' })).toBe('a@x.test → b@x.test');
    expect(detailWords(['head', 'artist'])).toBe('head, artist');
  });
});
