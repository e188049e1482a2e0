import { describe, expect, it } from 'vitest';
import {
  addYears,
  DEFAULT_RETENTION_YEARS,
  formatDay,
  governingStorageConsent,
  retentionStatus,
  REVIEW_SOON_DAYS,
  reviewDate,
} from '#shared/domain/archive-retention.ts';

const d = (iso: string) => new Date(iso);
const held = { status: 'in_store' as const };
const consent = (signed: string, expires: string | null = null, withdrawn: string | null = null) => ({
  signedAt: d(signed),
  expiresAt: expires ? d(expires) : null,
  withdrawnAt: withdrawn ? d(withdrawn) : null,
});

describe('review date', () => {
  it('is the consent’s own expiry when it has one', () => {
    expect(reviewDate(consent('2026-01-15T10:00:00Z', '2030-06-01T00:00:00Z'))).toEqual(d('2030-06-01T00:00:00Z'));
  });
  it('otherwise the signing date plus the retention term, 5 years unless changed', () => {
    // common practice, no published source: five years is the studio's default term, and it is editable.
    expect(DEFAULT_RETENTION_YEARS).toBe(5);
    expect(reviewDate(consent('2026-01-15T10:00:00Z'))).toEqual(d('2031-01-15T10:00:00Z'));
    expect(reviewDate(consent('2026-01-15T10:00:00Z'), 2)).toEqual(d('2028-01-15T10:00:00Z'));
  });
  it('adds calendar years: 29 February lands on 28 February when the year has none', () => {
    // Gregorian calendar (ISO 8601's calendar): 2028 is a leap year, 2029 is not.
    expect(addYears(d('2024-02-29T09:00:00Z'), 4)).toEqual(d('2028-02-29T09:00:00Z'));
    expect(addYears(d('2024-02-29T09:00:00Z'), 5)).toEqual(d('2029-02-28T09:00:00Z'));
    // Gregorian calendar: 2100 is a century year not divisible by 400, so not a leap year.
    expect(addYears(d('2096-02-29T00:00:00Z'), 4)).toEqual(d('2100-02-28T00:00:00Z'));
  });
});

describe('retentionStatus', () => {
  const signed = consent('2022-03-01T00:00:00Z');
  it('kept while the review date is more than the window away', () => {
    const s = retentionStatus(held, signed, d('2026-01-01T00:00:00Z'));
    expect(s).toEqual({
      state: 'kept',
      reviewOn: d('2027-03-01T00:00:00Z'),
      reason: 'Kept until 1 March 2027: the storage consent was signed on 1 March 2022, and casts are kept 5 years from signing.',
    });
  });
  it('review soon inside the window, counting the days left', () => {
    expect(REVIEW_SOON_DAYS).toBe(60);
    const s = retentionStatus(held, signed, d('2027-01-30T00:00:00Z'));
    expect(s.state).toBe('review_soon');
    // Calendar count, February 2027 having 28 days: 30 January to 1 March is 30 days; 31 December 2026 is 60 days before.
    expect(s.reason).toMatch(/^Review due on 1 March 2027, in 30 days/);
    expect(retentionStatus(held, signed, d('2026-12-31T00:00:00Z')).state).toBe('review_soon');
    expect(retentionStatus(held, signed, d('2026-12-30T00:00:00Z')).state).toBe('kept');
    expect(retentionStatus(held, signed, d('2027-01-30T00:00:00Z'), { soonDays: 10 }).state).toBe('kept');
  });
  // GDPR Art. 5(1)(e), storage limitation: kept "for no longer than is necessary".
  it('due once the review date has passed', () => {
    const s = retentionStatus(held, signed, d('2027-03-01T00:00:00Z'));
    expect(s.state).toBe('due');
    expect(s.reason).toBe(
      'The review date 1 March 2027 has passed (the storage consent was signed on 1 March 2022, and casts are kept 5 years from signing); the cast is due for return or destruction.',
    );
  });
  // GDPR Art. 5(1)(e): an expired storage consent no longer supports keeping the cast.
  it('due once an expiring consent has expired, saying so', () => {
    const s = retentionStatus(held, consent('2021-01-01T00:00:00Z', '2025-12-31T00:00:00Z'), d('2026-01-05T00:00:00Z'));
    expect(s).toMatchObject({ state: 'due', reviewOn: d('2025-12-31T00:00:00Z') });
    expect(s.reason).toMatch(/runs until 31 December 2025/);
  });
  // GDPR Art. 7(3): consent may be withdrawn at any time, as easily as it was given.
  it('a withdrawn storage consent makes the cast due at once, whatever the review date', () => {
    const s = retentionStatus(held, consent('2026-01-01T00:00:00Z', null, '2026-02-10T08:00:00Z'), d('2026-02-10T09:00:00Z'));
    expect(s).toEqual({
      state: 'due',
      reviewOn: d('2026-02-10T08:00:00Z'),
      reason: 'The performer withdrew their storage consent on 10 February 2026, so the cast is due for return or destruction now.',
    });
  });
  it('a withdrawal dated ahead brings the review date forward to it', () => {
    const s = retentionStatus(held, consent('2026-01-01T00:00:00Z', null, '2026-03-01T00:00:00Z'), d('2026-02-10T00:00:00Z'));
    expect(s).toMatchObject({ state: 'review_soon', reviewOn: d('2026-03-01T00:00:00Z') });
  });
  // GDPR Art. 7(1): the controller must be able to show consent; with none on file there is nothing to show.
  it('no storage consent at all: due at once, and says why in words', () => {
    const s = retentionStatus(held, null, d('2026-02-10T09:00:00Z'));
    expect(s.state).toBe('due');
    expect(s.reviewOn).toBeNull();
    expect(s.reason).toMatch(/^No storage consent is on file for this performer/);
  });
  it('a cast no longer held is not reviewed', () => {
    expect(retentionStatus({ status: 'destroyed' }, null, d('2026-02-10T09:00:00Z')).state).toBe('ended');
    expect(retentionStatus({ status: 'returned_to_performer' }, signed, d('2030-01-01T00:00:00Z'))).toMatchObject({ state: 'ended', reviewOn: null });
  });
  it('checked-out and lent casts are reviewed like those in store', () => {
    expect(retentionStatus({ status: 'checked_out' }, null, d('2026-02-10T09:00:00Z')).state).toBe('due');
    expect(retentionStatus({ status: 'on_loan' }, signed, d('2026-01-01T00:00:00Z')).state).toBe('kept');
  });
});

describe('governingStorageConsent', () => {
  const now = d('2026-06-01T00:00:00Z');
  it('the latest signing speaks, unless a withdrawal came after it', () => {
    const old = { id: 'old', ...consent('2024-01-01T00:00:00Z') };
    const renewed = { id: 'new', ...consent('2026-01-01T00:00:00Z') };
    expect(governingStorageConsent([old, renewed], now)?.id).toBe('new');
    const withdrawnLater = { id: 'old', ...consent('2024-01-01T00:00:00Z', null, '2026-03-01T00:00:00Z') };
    expect(governingStorageConsent([withdrawnLater, renewed], now)?.id).toBe('old');
    const withdrawnBefore = { id: 'old', ...consent('2024-01-01T00:00:00Z', null, '2025-03-01T00:00:00Z') };
    expect(governingStorageConsent([withdrawnBefore, renewed], now)?.id).toBe('new');
  });
  it('ignores what is signed or withdrawn after the moment asked about, and has nothing to say for no consents', () => {
    const future = { id: 'f', ...consent('2026-07-01T00:00:00Z') };
    expect(governingStorageConsent([future], now)).toBeNull();
    expect(governingStorageConsent([], now)).toBeNull();
    const laterWithdrawal = { id: 'w', ...consent('2025-01-01T00:00:00Z', null, '2026-09-01T00:00:00Z') };
    expect(governingStorageConsent([laterWithdrawal], now)?.id).toBe('w');
  });
});

describe('formatDay', () => {
  it('writes the day in words, read in UTC', () => {
    expect(formatDay(d('2026-02-10T23:30:00Z'))).toBe('10 February 2026');
    expect(formatDay(d('2026-02-10T23:30:00-05:00'))).toBe('11 February 2026');
  });
});
