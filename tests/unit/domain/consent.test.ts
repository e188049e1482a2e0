import { describe, expect, it } from 'vitest';
import { bookingsMissingConsent, consentKindNeeded, sessionsMissingConsent } from '#shared/domain/bookings.ts';
import {
  consentState,
  coversMoment,
  expiringWithin,
  expiryFor,
  hasActiveConsent,
  withdrawalConsequences,
  CONSENT_KINDS,
} from '#shared/domain/consent.ts';

const d = (iso: string) => new Date(iso);

describe('expiryFor', () => {
  it('adds the validity in whole days to the signing time', () => {
    expect(expiryFor(d('2026-01-01T10:00:00Z'), 365)?.toISOString()).toBe('2027-01-01T10:00:00.000Z');
    expect(expiryFor(d('2026-03-01T00:00:00Z'), 30)?.toISOString()).toBe('2026-03-31T00:00:00.000Z');
  });
  it('a template without a validity gives a consent that lasts until withdrawn', () => {
    expect(expiryFor(d('2026-01-01T00:00:00Z'), null)).toBeNull();
  });
});

describe('consentState', () => {
  const signed = { signedAt: d('2026-01-01T00:00:00Z'), expiresAt: d('2026-02-01T00:00:00Z'), withdrawnAt: null };
  it('is active until the expiry instant and expired from it', () => {
    expect(consentState(signed, d('2026-01-31T23:59:59Z'))).toBe('active');
    expect(consentState(signed, d('2026-02-01T00:00:00Z'))).toBe('expired');
  });
  it('withdrawal wins over expiry, and is not retroactive', () => {
    const w = { ...signed, withdrawnAt: d('2026-01-15T00:00:00Z') };
    expect(consentState(w, d('2026-01-10T00:00:00Z'))).toBe('active');
    expect(consentState(w, d('2026-01-15T00:00:00Z'))).toBe('withdrawn');
    expect(consentState(w, d('2026-03-01T00:00:00Z'))).toBe('withdrawn');
  });
  it('a consent only covers moments after it was signed', () => {
    expect(coversMoment(signed, d('2025-12-31T23:59:59Z'))).toBe(false);
    expect(coversMoment(signed, d('2026-01-01T00:00:00Z'))).toBe(true);
  });
});

describe('gates', () => {
  it('each kind of session needs its own consent', () => {
    expect(consentKindNeeded('patch_test')).toBe('patch_testing');
    expect(consentKindNeeded('life_cast')).toBe('life_casting');
    expect(consentKindNeeded('application')).toBe('application');
  });
  it('hasActiveConsent looks only at the kind asked for', () => {
    const list = [{ kind: 'life_casting' as const, signedAt: d('2026-01-01T00:00:00Z'), expiresAt: null, withdrawnAt: null }];
    expect(hasActiveConsent(list, 'life_casting', d('2026-05-01T00:00:00Z'))).toBe(true);
    expect(hasActiveConsent(list, 'patch_testing', d('2026-05-01T00:00:00Z'))).toBe(false);
  });
  it('bookingsMissingConsent flags a session whose consent lapses before it starts', () => {
    const consents = new Map([
      ['p1', [{ kind: 'patch_testing' as const, signedAt: d('2026-01-01T00:00:00Z'), expiresAt: d('2026-06-01T00:00:00Z'), withdrawnAt: null }]],
      ['p2', [{ kind: 'life_casting' as const, signedAt: d('2026-01-01T00:00:00Z'), expiresAt: null, withdrawnAt: d('2026-02-01T00:00:00Z') }]],
    ]);
    const bookings = [
      { id: 'b1', performerId: 'p1', purpose: 'patch_test' as const, startsAt: d('2026-05-01T09:00:00Z') },
      { id: 'b2', performerId: 'p1', purpose: 'patch_test' as const, startsAt: d('2026-07-01T09:00:00Z') },
      { id: 'b3', performerId: 'p2', purpose: 'life_cast' as const, startsAt: d('2026-03-01T09:00:00Z') },
      { id: 'b4', performerId: 'p3', purpose: 'application' as const, startsAt: d('2026-03-01T09:00:00Z') },
    ];
    expect(bookingsMissingConsent(bookings, consents).map((m) => `${m.booking.id}:${m.kind}`)).toEqual(['b2:patch_testing', 'b3:life_casting', 'b4:application']);
  });
  it('sessionsMissingConsent counts only consents given to the session’s own production, or to none', () => {
    const signed = { kind: 'life_casting' as const, signedAt: d('2026-01-01T00:00:00Z'), expiresAt: null, withdrawnAt: null, performerId: 'p1' };
    const sessions = [
      { id: 's1', performerId: 'p1', productionId: 'A', purpose: 'life_cast' as const, startsAt: d('2026-03-01T09:00:00Z'), status: 'booked' },
      { id: 's2', performerId: 'p1', productionId: 'B', purpose: 'life_cast' as const, startsAt: d('2026-03-01T09:00:00Z'), status: 'booked' },
      { id: 's3', performerId: 'p1', productionId: 'B', purpose: 'life_cast' as const, startsAt: d('2026-03-01T09:00:00Z'), status: 'cancelled' },
    ];
    // Given to production A: covers A's session only; a cancelled session needs nothing.
    expect([...sessionsMissingConsent(sessions, [{ ...signed, productionId: 'A' }])]).toEqual(['s2']);
    // Naming no production: covers every one.
    expect([...sessionsMissingConsent(sessions, [{ ...signed, productionId: null }])]).toEqual([]);
  });
  it('expiringWithin lists active consents ending inside the window only', () => {
    const now = d('2026-06-01T00:00:00Z');
    const list = [
      { id: 'soon', signedAt: d('2025-06-20T00:00:00Z'), expiresAt: d('2026-06-20T00:00:00Z'), withdrawnAt: null },
      { id: 'later', signedAt: d('2026-01-01T00:00:00Z'), expiresAt: d('2026-09-01T00:00:00Z'), withdrawnAt: null },
      { id: 'gone', signedAt: d('2025-01-01T00:00:00Z'), expiresAt: d('2026-05-01T00:00:00Z'), withdrawnAt: null },
      { id: 'open-ended', signedAt: d('2026-01-01T00:00:00Z'), expiresAt: null, withdrawnAt: null },
    ];
    expect(expiringWithin(list, now, 30).map((c) => c.id)).toEqual(['soon']);
  });
});

describe('withdrawalConsequences', () => {
  it('names a consequence for every kind, and says withdrawal is not retroactive', () => {
    for (const kind of CONSENT_KINDS) {
      const c = withdrawalConsequences(kind);
      expect(c.length).toBeGreaterThanOrEqual(2);
      // GDPR Art. 7(3): withdrawal does not affect processing before it.
      expect(c.join(' ')).toMatch(/does not undo/);
    }
  });
  it('a withdrawn storage consent makes the casts due at once', () => {
    expect(withdrawalConsequences('cast_storage')[0]).toMatch(/due at once for return to you or destruction/);
  });
});
