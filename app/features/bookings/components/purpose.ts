import { BOOKING_PURPOSE_LABELS, consentKindNeeded, type BookingPurpose } from '#shared/domain/bookings.ts';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';

export { BOOKING_PURPOSE_LABELS };

/** "Patch testing consent": the consent a session of this purpose needs. */
export function neededConsentLabel(purpose: BookingPurpose): string {
  return `${CONSENT_KIND_LABELS[consentKindNeeded(purpose)]} consent`;
}
