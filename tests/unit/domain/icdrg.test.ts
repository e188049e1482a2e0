import { describe, expect, it } from 'vitest';
import {
  ICDRG_CODES,
  ICDRG_LABELS,
  icdrgScore,
  icdrgStrength,
  isDoubtfulOrIrritant,
  isPositive,
  normaliseIcdrgCode,
  strongestCode,
} from '#shared/domain/icdrg.ts';
import { IcdrgCodeSchema } from '#shared/schemas/patch-tests.ts';

describe('the ICDRG code list', () => {
  it('is the closed list of seven codes', () => {
    // ICDRG reading table, Environ Health 2003;2:3, Table 1; IR and NT wording ESCD 2015 (from memory)
    expect([...ICDRG_CODES].sort()).toEqual(['+', '++', '+++', '-', '?+', 'IR', 'NT'].sort());
  });

  it('labels each code in plain words', () => {
    // Environ Health 2003;2:3, Table 1: negative, doubtful, weak / strong / extreme positive
    expect(ICDRG_LABELS['-']).toBe('Negative');
    expect(ICDRG_LABELS['?+']).toBe('Doubtful');
    expect(ICDRG_LABELS['+']).toBe('Weak positive');
    expect(ICDRG_LABELS['++']).toBe('Strong positive');
    expect(ICDRG_LABELS['+++']).toBe('Extreme positive');
    // Khanna, Illustrated Synopsis of Dermatology (irritant reaction); ESCD 2015 (not tested, from memory)
    expect(ICDRG_LABELS.IR).toBe('Irritant reaction');
    expect(ICDRG_LABELS.NT).toBe('Not tested');
  });

  it('treats ?+ as doubtful and not positive, and + as the first positive', () => {
    // Environ Health 2003;2:3 T1: ?+ is faint erythema only; + requires infiltration
    expect(isPositive('?+')).toBe(false);
    expect(isPositive('+')).toBe(true);
    expect(isPositive('++')).toBe(true);
    expect(isPositive('+++')).toBe(true);
    expect(isPositive('IR')).toBe(false);
    expect(isPositive('-')).toBe(false);
    expect(isDoubtfulOrIrritant('?+')).toBe(true);
    expect(isDoubtfulOrIrritant('IR')).toBe(true);
    expect(isDoubtfulOrIrritant('+')).toBe(false);
  });
});

describe('normaliseIcdrgCode', () => {
  it('reads +? as ?+', () => {
    // Environ Health 2003;2:3 T1: the doubtful grade, also written +?
    expect(normaliseIcdrgCode('+?')).toBe('?+');
    expect(normaliseIcdrgCode('?+')).toBe('?+');
  });
  it('reads ± as doubtful, the symbol of the numeric tables', () => {
    // Biomed Dermatol 2019, doi 10.1186/s41702-019-0053-z, Tab. 1 writes the doubtful grade as ±
    expect(normaliseIcdrgCode('±')).toBe('?+');
  });
  it('ignores case and spacing and reads a typographic minus as negative', () => {
    expect(normaliseIcdrgCode(' ir ')).toBe('IR');
    expect(normaliseIcdrgCode('nt')).toBe('NT');
    expect(normaliseIcdrgCode('\u2212')).toBe('-');
    expect(normaliseIcdrgCode('+ +')).toBe('++');
  });
  it('refuses anything off the list', () => {
    expect(normaliseIcdrgCode('++++')).toBeNull();
    expect(normaliseIcdrgCode('positive')).toBeNull();
    expect(normaliseIcdrgCode('')).toBeNull();
  });
  it('is what the request schema applies', () => {
    expect(IcdrgCodeSchema.parse('+?')).toBe('?+');
    expect(IcdrgCodeSchema.safeParse('2').success).toBe(false);
  });
});

describe('the derived numeric view', () => {
  it('maps doubtful to 0.5 and the positives to 1, 2 and 3', () => {
    // Biomed Dermatol 2019, doi 10.1186/s41702-019-0053-z, Tab. 1: ± 0.5, + 1, ++ 2, +++ 3
    expect(icdrgScore('?+')).toBe(0.5);
    expect(icdrgScore('+')).toBe(1);
    expect(icdrgScore('++')).toBe(2);
    expect(icdrgScore('+++')).toBe(3);
    // common practice, no published source: negative is zero
    expect(icdrgScore('-')).toBe(0);
  });
  it('gives no number to irritant or not-tested sites, which are off the allergic scale', () => {
    expect(icdrgScore('IR')).toBeNull();
    expect(icdrgScore('NT')).toBeNull();
  });
});

describe('strength and the strongest code', () => {
  it('orders the positives by the numeric view', () => {
    // Biomed Dermatol 2019 Tab. 1 ordering
    expect(icdrgStrength('+')).toBeLessThan(icdrgStrength('++'));
    expect(icdrgStrength('++')).toBeLessThan(icdrgStrength('+++'));
    expect(icdrgStrength('?+')).toBeLessThan(icdrgStrength('+'));
  });
  it('places an irritant call above doubtful and below weak positive', () => {
    expect(strongestCode(['?+', 'IR', '-'])).toBe('IR');
    expect(strongestCode(['IR', '+'])).toBe('+');
  });
  it('ignores not-tested sites, and has nothing to say about none', () => {
    expect(strongestCode(['NT', '-', 'NT'])).toBe('-');
    expect(strongestCode(['NT'])).toBeNull();
    expect(strongestCode([])).toBeNull();
  });
});
