import { describe, expect, it } from 'vitest';
import { summarizeConsents, type SummaryConsent } from '#shared/domain/consent-summary.ts';

// The 30-day "expiring" window is Plinth's own rule (the same one the department's home counts);
// the states follow the handbook's consent validity: active, expired, withdrawn.
const NOW = new Date('2026-12-02T10:00:00Z');
const P = '11111111-1111-4111-8111-111111111111';
const Q = '22222222-2222-4222-8222-222222222222';
const days = (n: number) => new Date(NOW.getTime() + n * 86_400_000);

function consent(c: Partial<SummaryConsent>): SummaryConsent {
  return { kind: 'life_casting', productionId: P, signedAt: days(-10), expiresAt: null, withdrawnAt: null, ...c };
}
function coverOf(list: SummaryConsent[], kind: SummaryConsent['kind'], productionId: string | null = P) {
  return summarizeConsents(list, NOW, productionId).find((k) => k.kind === kind);
}

describe('summarizeConsents', () => {
  it('lists every kind, missing when nothing was signed', () => {
    const summary = summarizeConsents([], NOW, P);
    expect(summary.map((k) => k.kind)).toEqual(['life_casting', 'patch_testing', 'application', 'cast_storage', 'health_data']);
    expect(summary.every((k) => k.cover === 'missing')).toBe(true);
  });

  it('counts a consent with no end as in force, and one ending in 31 days too', () => {
    expect(coverOf([consent({})], 'life_casting')?.cover).toBe('in_force');
    expect(coverOf([consent({ expiresAt: days(31) })], 'life_casting')?.cover).toBe('in_force');
  });

  it('flags cover ending within 30 days, with its end', () => {
    expect(coverOf([consent({ expiresAt: days(30) })], 'life_casting')).toEqual({ kind: 'life_casting', cover: 'expiring', endsAt: days(30) });
  });

  it('lets the longest-running consent of a kind decide', () => {
    expect(coverOf([consent({ expiresAt: days(5) }), consent({ expiresAt: days(200) })], 'life_casting')?.cover).toBe('in_force');
  });

  it('treats expired and withdrawn consents as missing', () => {
    expect(coverOf([consent({ expiresAt: days(-1) })], 'life_casting')?.cover).toBe('missing');
    expect(coverOf([consent({ withdrawnAt: days(-1) })], 'life_casting')?.cover).toBe('missing');
  });

  it('counts only consents given to this production or naming none', () => {
    expect(coverOf([consent({ productionId: Q })], 'life_casting')?.cover).toBe('missing');
    expect(coverOf([consent({ productionId: null })], 'life_casting')?.cover).toBe('in_force');
    // With no production in view (the performer's own page), every consent counts.
    expect(coverOf([consent({ productionId: Q })], 'life_casting', null)?.cover).toBe('in_force');
  });
});
