import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { sessionsWithWithdrawnConsent, type ConsentForGate } from '#shared/domain/bookings.ts';
import { addDays, daysOf, startOfWeek } from '#shared/domain/calendar.ts';
import { isNewSince, needsLeadLook } from '#shared/domain/health-review.ts';
import { dateInWords, dateTimeInWords, listInWords } from '#shared/domain/words.ts';

const DAY = 86_400_000;

describe('dates in words', () => {
  it('prints weekday, day, month and year on the studio clock, as luxon (an independent library) does', () => {
    const at = new Date('2026-12-09T14:30:00Z');
    const ref = DateTime.fromJSDate(at, { zone: 'Europe/London' }).setLocale('en-GB');
    expect(dateInWords(at, 'Europe/London')).toBe(ref.toFormat('cccc d LLLL yyyy'));
    expect(dateTimeInWords(at, 'Europe/London')).toBe(`${ref.toFormat('cccc d LLLL yyyy')} at ${ref.toFormat('HH:mm')}`);
    // Summer time (BST, UTC+1): the clock, not UTC, decides the hour and even the day.
    const late = new Date('2027-07-01T23:30:00Z');
    expect(dateTimeInWords(late, 'Europe/London')).toBe(DateTime.fromJSDate(late, { zone: 'Europe/London' }).setLocale('en-GB').toFormat("cccc d LLLL yyyy 'at' HH:mm"));
  });

  it('joins names as a sentence does', () => {
    expect(listInWords([])).toBe('');
    expect(listInWords(['Marta Oyelaran'])).toBe('Marta Oyelaran');
    expect(listInWords(['A', 'B', 'C'])).toBe('A, B and C');
  });
});

describe('calendar windows', () => {
  it('weeks start on Monday (ISO 8601), matching luxon', () => {
    for (const iso of ['2026-12-02T10:00:00', '2026-12-06T23:59:00', '2026-12-07T00:00:00', '2027-03-28T12:00:00']) {
      const at = new Date(iso);
      expect(startOfWeek(at).getTime(), iso).toBe(DateTime.fromJSDate(at).startOf('week').toJSDate().getTime());
    }
  });

  it('a week view holds seven consecutive local days, across a change of clocks', () => {
    // 28 March 2027: clocks go forward in Europe (a 23-hour day where the test runs in such a zone).
    const days = daysOf('week', new Date('2027-03-24T12:00:00'));
    expect(days).toHaveLength(7);
    expect(days.map((d) => d.getDate())).toEqual([22, 23, 24, 25, 26, 27, 28]);
    expect(days.every((d) => d.getHours() === 0)).toBe(true);
    expect(addDays(days[6]!, 1).getDate()).toBe(29);
    expect(daysOf('day', new Date('2027-03-24T12:00:00'))).toHaveLength(1);
  });
});

describe("the lead's look", () => {
  const yesNo = { type: 'yes_no' as const, medical: true };
  it('a "yes" to a health question needs a look; a "no" or a yes to a question that is not health does not', () => {
    expect(needsLeadLook('life_casting', yesNo, true)).toBe(true);
    expect(needsLeadLook('life_casting', yesNo, false)).toBe(false);
    expect(needsLeadLook('life_casting', { type: 'yes_no', medical: false }, true)).toBe(false);
    // Every answer of a health-data form is a health detail.
    expect(needsLeadLook('health_data', { type: 'yes_no', medical: false }, true)).toBe(true);
  });

  it('free text needs a look only in a health-data form, and only when something was written', () => {
    expect(needsLeadLook('health_data', { type: 'short_text', medical: false }, 'Mild eczema')).toBe(true);
    expect(needsLeadLook('health_data', { type: 'short_text', medical: false }, '  ')).toBe(false);
    expect(needsLeadLook('patch_testing', { type: 'short_text', medical: true }, 'Plasters itch')).toBe(false);
    expect(needsLeadLook('health_data', { type: 'choice', medical: true }, 'Up to 8 hours')).toBe(false);
  });

  it('only answers signed after the last confirmation are new', () => {
    const at = new Date('2026-12-01T10:00:00Z');
    expect(isNewSince(at, null)).toBe(true);
    expect(isNewSince(at, new Date(at.getTime() - 1))).toBe(true);
    expect(isNewSince(at, at)).toBe(false);
  });
});

describe('a session that lost its consent', () => {
  const now = Date.now();
  const session = { id: 's', performerId: 'p', productionId: 'P1', purpose: 'life_cast' as const, startsAt: new Date(now + 3 * DAY), status: 'booked' };
  const consent = (over: Partial<ConsentForGate>): ConsentForGate => ({ performerId: 'p', productionId: 'P1', kind: 'life_casting', signedAt: new Date(now - 10 * DAY), expiresAt: null, withdrawnAt: null, ...over });

  it('is flagged when a withdrawn consent of its kind would otherwise have covered it', () => {
    expect(sessionsWithWithdrawnConsent([session], [consent({ withdrawnAt: new Date(now - DAY) })]).has('s')).toBe(true);
  });
  it('is not, when it never had one, when another production holds it, or when a new consent covers it again', () => {
    expect(sessionsWithWithdrawnConsent([session], []).has('s')).toBe(false);
    expect(sessionsWithWithdrawnConsent([session], [consent({ productionId: 'P2', withdrawnAt: new Date(now - DAY) })]).has('s')).toBe(false);
    expect(sessionsWithWithdrawnConsent([session], [consent({ withdrawnAt: new Date(now - DAY) }), consent({ signedAt: new Date(now - 1000) })]).has('s')).toBe(false);
    // An expired consent that was also withdrawn would not have covered the session anyway.
    expect(sessionsWithWithdrawnConsent([session], [consent({ expiresAt: new Date(now + DAY), withdrawnAt: new Date(now - DAY) })]).has('s')).toBe(false);
  });
});
