import { describe, expect, it } from 'vitest';
import { AUDIT_ACTION_LABELS } from '#shared/domain/audit.ts';
import { auditActionChoices, detailWords, humanize, recordWords } from '#app/features/audit/components/audit-words.ts';

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

  it('offers groups of events by their dot and every event once, all in words', () => {
    const { groups, events } = auditActionChoices({ 'consent.sign': 'Consent signed', 'consent.withdraw': 'Consent withdrawn', 'medical.read': 'Read health details', 'new_thing.do': 'Did a new thing', 'new_thing.undo': 'Undid a new thing' });
    expect(groups).toEqual([
      { value: 'consent.', words: 'Consents: any' },
      { value: 'new_thing.', words: 'New thing: any' },
    ]);
    expect(events.map((e) => e.value)).toEqual(['consent.sign', 'consent.withdraw', 'new_thing.do', 'medical.read', 'new_thing.undo']);
    const all = auditActionChoices(AUDIT_ACTION_LABELS);
    expect(all.events).toHaveLength(Object.keys(AUDIT_ACTION_LABELS).length);
    for (const c of [...all.groups, ...all.events]) expect(c.words).not.toMatch(/[._]/);
  });
});
