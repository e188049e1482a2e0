import { describe, expect, it } from 'vitest';
import { mailDate, mailDateTime } from '../../api/mail/dates.ts';

// Clock facts from the IANA time zone database: London is on GMT in December and on BST (UTC+1)
// in July; 2 December 2026 is a Wednesday (Gregorian calendar).
describe('mailDateTime', () => {
  it('writes the moment in words on the studio clock, naming the clock', () => {
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'Europe/London')).toBe('Wednesday 2 December 2026 at 16:02, London time');
    expect(mailDateTime(new Date('2026-07-01T12:00:00Z'), 'Europe/London')).toBe('Wednesday 1 July 2026 at 13:00, London time');
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'UTC')).toBe('Wednesday 2 December 2026 at 16:02, UTC');
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'America/New_York')).toBe('Wednesday 2 December 2026 at 11:02, New York time');
  });
  it('never writes an HTTP date or an ISO string', () => {
    const words = mailDateTime(new Date('2026-12-02T16:02:00Z'), 'Europe/London');
    expect(words).not.toMatch(/GMT|\d{2}:\d{2}:\d{2}/);
    expect(words).not.toMatch(/\d{4}-\d{2}-\d{2}/);
  });

  // Reference: the ECMA-402 Intl.DateTimeFormat built into Node (ICU data), asked for the whole en-GB
  // "full" date and "short" time in one call rather than assembled from parts as the helper does. Its
  // en-GB full date puts a comma after the weekday, which a letter leaves out, so that comma is dropped.
  const reference = (at: Date, timeZone: string) =>
    new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'full', timeStyle: 'short' })
      .format(at)
      .replace(/^(\w+day), /, '$1 ')
      .replace(/, (\d{2}:\d{2})$/, ' at $1');
  const referenceDay = (at: Date, timeZone: string) => new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'full' }).format(at).replace(/^(\w+day), /, '$1 ');

  const moments = [
    '2026-12-02T14:30:00Z',
    '2026-03-29T00:59:00Z', // London's clocks go forward at 01:00 UTC that day (IANA tz database)
    '2026-03-29T01:00:00Z',
    '2026-10-25T00:30:00Z', // and back at 01:00 UTC
    '2027-07-01T23:30:00Z', // after midnight in London, still the 1st in UTC
    '2026-12-31T23:45:00Z',
    '2028-02-29T08:05:00Z',
  ];
  const zones = ['Europe/London', 'America/New_York', 'Asia/Kolkata', 'Pacific/Auckland', 'UTC'];

  it('agrees with Intl.DateTimeFormat on the day and the clock time, across zones and clock changes', () => {
    for (const iso of moments) {
      for (const zone of zones) {
        const at = new Date(iso);
        expect(mailDateTime(at, zone).replace(/, [A-Za-z ]+ time$|, UTC$/, ''), `${iso} in ${zone}`).toBe(reference(at, zone));
        expect(mailDate(at, zone), `${iso} in ${zone}`).toBe(referenceDay(at, zone));
      }
    }
  });
});
