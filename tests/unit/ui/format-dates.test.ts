import { describe, expect, it } from 'vitest';
import { formatClock, formatDayTitle, formatLongDate } from '#app/lib/format.ts';
import { countClearances } from '#app/features/patch-tests/components/clearance-counts.ts';

// Expected words are the Unicode CLDR patterns for each locale (as shipped in Node's ICU): British
// English puts the day before the month without a comma and keeps a 24-hour clock, American English
// a 12-hour clock with AM/PM, German a comma after the weekday and a full stop after the day number.
const monday = new Date(2026, 11, 7, 14, 5);

describe('calendar date words', () => {
  it('words a day, a date and a time in the locale named', () => {
    expect(formatDayTitle(monday, 'en-GB')).toBe('Monday 7 December');
    expect(formatLongDate(monday, 'en-GB')).toBe('7 December 2026');
    expect(formatClock(monday, 'en-GB')).toBe('14:05');
    expect(formatDayTitle(monday, 'en-US')).toBe('Monday, December 7');
    expect(formatLongDate(monday, 'en-US')).toBe('December 7, 2026');
    expect(formatClock(monday, 'en-US')).toMatch(/^02:05\sPM$/);
    expect(formatDayTitle(monday, 'de-DE')).toBe('Montag, 7. Dezember');
    expect(formatLongDate(monday, 'de-DE')).toBe('7. Dezember 2026');
    expect(formatClock(monday, 'de-DE')).toBe('14:05');
  });

  it('uses the runtime’s own locale when none is named, not a fixed one', () => {
    const own = new Intl.DateTimeFormat().resolvedOptions().locale;
    expect(formatDayTitle(monday)).toBe(formatDayTitle(monday, own));
    expect(formatLongDate(monday)).toBe(formatLongDate(monday, own));
    expect(formatClock(monday)).toBe(formatClock(monday, own));
  });

  it('takes an instant as a string, and gives back what is not a date unchanged', () => {
    expect(formatClock(monday.toISOString(), 'en-GB')).toBe('14:05');
    expect(formatDayTitle(monday.toISOString(), 'en-GB')).toBe('Monday 7 December');
    expect(formatLongDate('not a date', 'en-GB')).toBe('not a date');
    expect(formatClock('', 'en-GB')).toBe('');
  });

  it('keeps one formatter per locale apart from another', () => {
    expect(formatDayTitle(monday, 'de-DE')).not.toBe(formatDayTitle(monday, 'en-GB'));
    expect(formatDayTitle(monday, 'en-GB')).toBe('Monday 7 December');
  });
});

// Plinth's own summary rule (no outside source): listed Untested rows are not counted as anything else.
describe('the clearance summary counts', () => {
  it('counts each state the line shows, and leaves Untested out', () => {
    const rows = (['cleared', 'cleared', 'caution', 'do_not_use', 'pending', 'untested', 'caution', 'caution'] as const).map((state) => ({ state }));
    expect(countClearances(rows)).toEqual({ cleared: 2, caution: 3, do_not_use: 1, pending: 1 });
    expect(countClearances([])).toEqual({ cleared: 0, caution: 0, do_not_use: 0, pending: 0 });
  });
});
