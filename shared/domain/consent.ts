/** Consent kinds Plinth knows, and the rules for when a signed consent counts. */

export const CONSENT_KINDS = ['life_casting', 'patch_testing', 'application', 'cast_storage', 'health_data'] as const;
export type ConsentKind = (typeof CONSENT_KINDS)[number];

export const CONSENT_KIND_LABELS: Record<ConsentKind, string> = {
  life_casting: 'Life casting',
  patch_testing: 'Patch testing',
  application: 'Application',
  cast_storage: 'Cast storage and likeness',
  health_data: 'Health data',
};

/** Short forms for dense tables; the full label is given to screen readers alongside. */
export const CONSENT_KIND_SHORT_LABELS: Record<ConsentKind, string> = {
  life_casting: 'Casting',
  patch_testing: 'Patch test',
  application: 'Application',
  cast_storage: 'Storage',
  health_data: 'Health data',
};

export type ConsentState = 'active' | 'expired' | 'withdrawn';

export const CONSENT_STATE_LABELS: Record<ConsentState, string> = {
  active: 'Active',
  expired: 'Expired',
  withdrawn: 'Withdrawn',
};

export interface ConsentTimes {
  signedAt: Date;
  expiresAt: Date | null;
  withdrawnAt: Date | null;
}

const DAY_MS = 86_400_000;

/** A consent runs from signing for the template's validity in days; no validity means until withdrawn. */
export function expiryFor(signedAt: Date, validityDays: number | null): Date | null {
  return validityDays == null ? null : new Date(signedAt.getTime() + validityDays * DAY_MS);
}

/** Withdrawn beats expired: a withdrawal is the performer's act and is shown as such. */
export function consentState(c: ConsentTimes, at: Date): ConsentState {
  if (c.withdrawnAt && c.withdrawnAt.getTime() <= at.getTime()) return 'withdrawn';
  if (c.expiresAt && c.expiresAt.getTime() <= at.getTime()) return 'expired';
  return 'active';
}

/** Does a consent cover a moment: signed before it, neither withdrawn nor expired by then? */
export function coversMoment(c: ConsentTimes, at: Date): boolean {
  return c.signedAt.getTime() <= at.getTime() && consentState(c, at) === 'active';
}

/** Whether a consent of this kind that is active now (and so could be withdrawn) exists. */
export function hasActiveConsent(consents: readonly (ConsentTimes & { kind: ConsentKind })[], kind: ConsentKind, now: Date): boolean {
  return consents.some((c) => c.kind === kind && coversMoment(c, now));
}

/** Active consents whose expiry falls within the next `days` days. */
export function expiringWithin<T extends ConsentTimes>(consents: readonly T[], now: Date, days: number): T[] {
  const limit = now.getTime() + days * DAY_MS;
  return consents.filter((c) => consentState(c, now) === 'active' && c.expiresAt != null && c.expiresAt.getTime() <= limit);
}

/** What withdrawing a consent of this kind sets in motion, in the words shown before confirming. */
export function withdrawalConsequences(kind: ConsentKind): string[] {
  const common = 'Withdrawing does not undo what was done while the consent was in force.';
  switch (kind) {
    case 'cast_storage':
      return [
        'Every stored life cast, mold and positive of you becomes due at once for return to you or destruction, with a witness.',
        'Photos of the casts will no longer be used.',
        common,
      ];
    case 'life_casting':
      return ['No new life cast can be taken of you until you sign a new consent.', common];
    case 'patch_testing':
      return ['No patch test can be applied to you until you sign a new consent. Tests already on your skin should be removed.', common];
    case 'application':
      return ['No make-up or prosthetic application can be logged for you until you sign a new consent.', common];
    case 'health_data':
      return ['Plinth stops using the health details you gave under this consent; the designated lead is told.', common];
  }
}
