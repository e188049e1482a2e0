import { describe, expect, it } from 'vitest';
import { DEMOLD_DEFAULT_NOTE, PLATINUM_APPLIANCE_DEMOLD_MINUTES, demoldAt, demoldTime } from '#shared/domain/cure.ts';

describe('demold time', () => {
  it('defaults to about 30 minutes at room temperature for a platinum silicone appliance', () => {
    // common practice, no published source
    expect(PLATINUM_APPLIANCE_DEMOLD_MINUTES).toBe(30);
    expect(demoldTime(null)).toEqual({ minutes: 30, source: 'default' });
  });

  it('says beside the default that the data sheet always wins', () => {
    expect(DEMOLD_DEFAULT_NOTE).toMatch(/30 minutes/);
    expect(DEMOLD_DEFAULT_NOTE).toMatch(/data sheet always wins/);
  });

  it('takes the data sheet over the default', () => {
    expect(demoldTime(75)).toEqual({ minutes: 75, source: 'data-sheet' });
    expect(demoldTime(75, 20)).toEqual({ minutes: 75, source: 'data-sheet' });
  });

  it('takes an edited default when there is no data sheet figure', () => {
    expect(demoldTime(undefined, 45)).toEqual({ minutes: 45, source: 'default' });
  });

  it('puts the demold moment that many minutes after the pour', () => {
    expect(demoldAt(new Date('2027-03-01T09:40:00Z'), 30).toISOString()).toBe('2027-03-01T10:10:00.000Z');
  });
});
