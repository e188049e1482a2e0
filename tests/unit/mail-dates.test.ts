import { describe, expect, it } from 'vitest';
import { mailDateTime } from '../../api/mail/dates.ts';

// Clock facts from the IANA time zone database: London is on GMT in December and on BST (UTC+1)
// in July; 2 December 2026 is a Wednesday (Gregorian calendar).
describe('mailDateTime', () => {
  it('writes the moment in words on the studio clock, naming the clock', () => {
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'Europe/London')).toBe('Wednesday 2 December 2026 at 16:02, London time');
    expect(mailDateTime(new Date('2026-07-01T12:00:00Z'), 'Europe/London')).toBe('Wednesday 1 July 2026 at 13:00, London time');
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'UTC')).toBe('Wednesday 2 December 2026 at 16:02, UTC');
  });
  it('never writes an HTTP date', () => {
    expect(mailDateTime(new Date('2026-12-02T16:02:00Z'), 'Europe/London')).not.toMatch(/GMT|\d{2}:\d{2}:\d{2}/);
  });
});
