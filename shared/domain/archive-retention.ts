/**
 * How long the archive may keep a performer's casts: until the review date set by their storage
 * consent. Past it, or once the consent is withdrawn or missing, a cast is due for return or destruction.
 */
import { isFinalStatus, type CastStatus } from './archive-casts.ts';
import type { ConsentTimes } from './consent.ts';

/** Retention term used when a storage consent has no expiry of its own; the studio may change it. */
export const DEFAULT_RETENTION_YEARS = 5;

/** How far ahead a coming review date is flagged, so there is time to ask the performer. */
export const REVIEW_SOON_DAYS = 60;

/** Kept, review soon, due for return or destruction, or no longer held. */
export type RetentionState = 'kept' | 'review_soon' | 'due' | 'ended';

/** Retention states in the product's words. */
export const RETENTION_STATE_LABELS: Record<RetentionState, string> = {
  kept: 'Kept',
  review_soon: 'Review soon',
  due: 'Due for return or destruction',
  ended: 'No longer held',
};

/** A cast's retention state, why, and its review date. */
export interface RetentionStatus {
  state: RetentionState;
  /** In the product's words, for the list of casts to review. */
  reason: string;
  /** When the cast is (or was) due for review; null when no consent gives one. */
  reviewOn: Date | null;
}

/** The studio's retention term and review-soon window, when it has changed the defaults. */
export interface RetentionOptions {
  retentionYears?: number;
  soonDays?: number;
}

const DAY_MS = 86_400_000;
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** Dates in reasons are written out in full, read in UTC so the same record always reads the same. */
export function formatDay(d: Date): string {
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/** Adds calendar years; 29 February becomes 28 February in a year without one, never 1 March. */
export function addYears(d: Date, years: number): Date {
  const year = d.getUTCFullYear() + years;
  const month = d.getUTCMonth();
  const lastDay = new Date(Date.UTC(year, month + 1, 0)).getUTCDate();
  const out = new Date(d.getTime());
  out.setUTCFullYear(year, month, Math.min(d.getUTCDate(), lastDay));
  return out;
}

/** The review date: the consent's own expiry when it has one, otherwise its signing date plus the retention term. */
export function reviewDate(consent: Pick<ConsentTimes, 'signedAt' | 'expiresAt'>, retentionYears = DEFAULT_RETENTION_YEARS): Date {
  return consent.expiresAt ?? addYears(consent.signedAt, retentionYears);
}

/**
 * Of the storage consents that cover a cast (its performer's, given to its production or naming
 * none), the one that speaks now: the latest word, so a withdrawal after the newest signing wins
 * and a new signing after a withdrawal restores consent.
 */
export function governingStorageConsent<T extends ConsentTimes>(consents: readonly T[], now: Date): T | null {
  const t = now.getTime();
  let signed: T | null = null;
  let withdrawn: T | null = null;
  for (const c of consents) {
    if (c.signedAt.getTime() <= t && (!signed || c.signedAt.getTime() > signed.signedAt.getTime())) signed = c;
    if (c.withdrawnAt && c.withdrawnAt.getTime() <= t && (!withdrawn || c.withdrawnAt.getTime() > withdrawn.withdrawnAt!.getTime())) withdrawn = c;
  }
  if (withdrawn && (!signed || withdrawn.withdrawnAt!.getTime() >= signed.signedAt.getTime())) return withdrawn;
  return signed;
}

/**
 * Whether the archive may go on keeping a cast. No consent or a withdrawn one makes it due at once;
 * otherwise it is kept until the review date, flagged in the weeks before it.
 */
export function retentionStatus(
  cast: { status: CastStatus },
  consent: ConsentTimes | null,
  now: Date,
  opts: RetentionOptions = {},
): RetentionStatus {
  const years = opts.retentionYears ?? DEFAULT_RETENTION_YEARS;
  const soonDays = opts.soonDays ?? REVIEW_SOON_DAYS;
  if (isFinalStatus(cast.status)) {
    const how = cast.status === 'destroyed' ? 'destroyed' : 'returned to the performer';
    return { state: 'ended', reason: `The cast has been ${how}; the archive no longer holds it.`, reviewOn: null };
  }
  if (!consent) {
    return {
      state: 'due',
      reason: 'No storage consent is on file for this performer, so there is nothing that lets the archive keep the cast: it is due for return or destruction now.',
      reviewOn: null,
    };
  }
  const t = now.getTime();
  if (consent.withdrawnAt && consent.withdrawnAt.getTime() <= t) {
    return {
      state: 'due',
      reason: `The performer withdrew their storage consent on ${formatDay(consent.withdrawnAt)}, so the cast is due for return or destruction now.`,
      reviewOn: consent.withdrawnAt,
    };
  }
  const term = reviewDate(consent, years);
  // A withdrawal already dated ahead brings the review forward to it.
  const reviewOn = consent.withdrawnAt && consent.withdrawnAt.getTime() < term.getTime() ? consent.withdrawnAt : term;
  const basis = consent.expiresAt
    ? `the storage consent runs until ${formatDay(consent.expiresAt)}`
    : `the storage consent was signed on ${formatDay(consent.signedAt)}, and casts are kept ${years} year${years === 1 ? '' : 's'} from signing`;
  if (t >= reviewOn.getTime()) {
    return {
      state: 'due',
      reason: `The review date ${formatDay(reviewOn)} has passed (${basis}); the cast is due for return or destruction.`,
      reviewOn,
    };
  }
  const daysLeft = Math.ceil((reviewOn.getTime() - t) / DAY_MS);
  if (daysLeft <= soonDays) {
    return {
      state: 'review_soon',
      reason: `Review due on ${formatDay(reviewOn)}, in ${daysLeft} day${daysLeft === 1 ? '' : 's'} (${basis}); ask the performer whether to sign a new storage consent or have the cast returned or destroyed.`,
      reviewOn,
    };
  }
  return { state: 'kept', reason: `Kept until ${formatDay(reviewOn)}: ${basis}.`, reviewOn };
}
