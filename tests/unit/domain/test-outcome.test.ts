import { describe, expect, it } from 'vitest';
import type { IcdrgCode } from '#shared/domain/icdrg.ts';
import { productOutcome, READING_PATTERN_TERMS, readingPattern } from '#shared/domain/test-outcome.ts';

const series = (codes: IcdrgCode[], start = Date.UTC(2026, 2, 4, 9)) =>
  codes.map((code, i) => ({ code, readAt: new Date(start + i * 2 * 86_400_000) }));

describe('readingPattern: the five dynamic patterns', () => {
  // Brasch et al., Contact Dermatitis 1996;35(1):17-22: crescendo, plateau, decrescendo,
  // crescendo/decrescendo, decrescendo/crescendo
  it('rising is crescendo: stronger at the later reading', () => {
    // MSD Manual Professional, "Contact dermatitis": crescendo = stronger at the 2nd reading
    expect(readingPattern(['?+', '+'])).toBe('rising');
    expect(readingPattern(['-', '+', '++'])).toBe('rising');
    expect(READING_PATTERN_TERMS.rising).toBe('crescendo');
  });
  it('steady is plateau', () => {
    expect(readingPattern(['+', '+'])).toBe('steady');
    expect(readingPattern(['++', '++', '++'])).toBe('steady');
    expect(READING_PATTERN_TERMS.steady).toBe('plateau');
  });
  it('fading is decrescendo', () => {
    // MSD Manual: decrescendo is typical of irritant or false-positive reactions
    expect(readingPattern(['++', '+'])).toBe('fading');
    expect(readingPattern(['IR', '-'])).toBe('fading');
    expect(READING_PATTERN_TERMS.fading).toBe('decrescendo');
  });
  it('rising then fading is crescendo–decrescendo', () => {
    expect(readingPattern(['+', '++', '+'])).toBe('rising_then_fading');
    expect(readingPattern(['?+', '+', '+', '-'])).toBe('rising_then_fading');
    expect(READING_PATTERN_TERMS.rising_then_fading).toBe('crescendo–decrescendo');
  });
  it('fading then rising is decrescendo–crescendo', () => {
    expect(readingPattern(['++', '+', '++'])).toBe('fading_then_rising');
    expect(READING_PATTERN_TERMS.fading_then_rising).toBe('decrescendo–crescendo');
  });
});

describe('readingPattern: edges', () => {
  it('ignores not-tested readings', () => {
    expect(readingPattern(['+', 'NT', '++'])).toBe('rising');
    expect(readingPattern(['NT', '+'])).toBe('single_reading');
    expect(readingPattern(['NT', 'NT'])).toBe('no_readings');
    expect(readingPattern([])).toBe('no_readings');
  });
  it('calls more than one turn up and down rather than forcing a named pattern', () => {
    // common practice, no published source: the five patterns describe at most one turn
    expect(readingPattern(['+', '++', '+', '++'])).toBe('up_and_down');
  });
  it('a negative run is steady', () => {
    expect(readingPattern(['-', '-', '-'])).toBe('steady');
  });
});

describe('productOutcome', () => {
  it('gives the strongest and the final code, the final being the last reading taken', () => {
    const o = productOutcome(series(['+', '++', '+']));
    expect(o.strongest).toBe('++');
    expect(o.final).toBe('+');
    expect(o.pattern).toBe('rising_then_fading');
    expect(o.gradedCount).toBe(3);
  });
  it('orders readings by time whatever order they arrive in', () => {
    const [a, b] = series(['?+', '++']);
    const o = productOutcome([b!, a!]);
    expect(o.final).toBe('++');
    expect(o.pattern).toBe('rising');
    expect(o.finalAt).toEqual(b!.readAt);
  });
  it('passes over a not-tested last reading to the last graded one', () => {
    const o = productOutcome(series(['-', '?+', 'NT']));
    expect(o.final).toBe('?+');
    expect(o.gradedCount).toBe(2);
  });
  it('has nothing to report before the first reading', () => {
    expect(productOutcome([])).toEqual({ strongest: null, final: null, finalAt: null, pattern: 'no_readings', gradedCount: 0 });
  });
});
