import { describe, expect, it } from 'vitest';
import { dayIn } from '../../api/jobs/define.ts';

// Offsets from the IANA time zone database (from memory): London is UTC+0 in winter and UTC+1
// from the last Sunday of March; Tokyo is UTC+9 all year; Los Angeles is UTC-8 in winter.
describe('dayIn: the calendar day "once a day" counts', () => {
  it('reads the day in the studio’s time zone, not in UTC', () => {
    const lateEvening = new Date('2027-03-01T23:30:00Z');
    expect(dayIn('Europe/London', lateEvening)).toBe('2027-03-01');
    expect(dayIn('Asia/Tokyo', lateEvening)).toBe('2027-03-02');
    expect(dayIn('America/Los_Angeles', new Date('2027-03-01T05:00:00Z'))).toBe('2027-02-28');
  });
  it('follows summer time: 23:30 UTC in July is already the next day in London', () => {
    expect(dayIn('Europe/London', new Date('2027-07-01T23:30:00Z'))).toBe('2027-07-02');
  });
});
