/** Sessions (bookings) of a production: what each is for, and which consent it needs in force. */
import { type ConsentKind, type ConsentTimes, consentState } from './consent.ts';

export const BOOKING_PURPOSES = ['patch_test', 'life_cast', 'application'] as const;
export type BookingPurpose = (typeof BOOKING_PURPOSES)[number];
export const BOOKING_PURPOSE_LABELS: Record<BookingPurpose, string> = {
  patch_test: 'Patch test',
  life_cast: 'Life cast',
  application: 'Application',
};

/** The gate each kind of session has: no patch test, life cast or logged application without its consent. */
export function consentKindNeeded(purpose: BookingPurpose): ConsentKind {
  switch (purpose) {
    case 'patch_test':
      return 'patch_testing';
    case 'life_cast':
      return 'life_casting';
    case 'application':
      return 'application';
  }
}

export interface BookingForGate {
  id: string;
  performerId: string;
  purpose: BookingPurpose;
  startsAt: Date;
}

/**
 * Upcoming bookings whose consent will not be in force when they start: none signed, withdrawn,
 * or expiring before the session. One entry per booking, naming the missing kind.
 */
export function bookingsMissingConsent(
  bookings: readonly BookingForGate[],
  consentsByPerformer: ReadonlyMap<string, readonly (ConsentTimes & { kind: ConsentKind })[]>,
): { booking: BookingForGate; kind: ConsentKind }[] {
  const out: { booking: BookingForGate; kind: ConsentKind }[] = [];
  for (const b of bookings) {
    const kind = consentKindNeeded(b.purpose);
    const consents = consentsByPerformer.get(b.performerId) ?? [];
    // Signed later than now but before the session still counts: the performer may sign on the day.
    const ok = consents.some((c) => c.kind === kind && consentState(c, b.startsAt) === 'active');
    if (!ok) out.push({ booking: b, kind });
  }
  return out;
}

export interface ConsentForGate extends ConsentTimes {
  kind: ConsentKind;
  performerId: string;
  /** The production the consent was given to; null means it names none and covers every one. */
  productionId: string | null;
}

/**
 * Which booked sessions lack the consent they need when they start. A session is covered only by
 * a consent given to its own production (or to none named): the one rule for every list of sessions.
 */
export function sessionsMissingConsent(
  sessions: readonly (BookingForGate & { productionId: string; status: string })[],
  consents: readonly ConsentForGate[],
): Set<string> {
  const missing = new Set<string>();
  for (const productionId of new Set(sessions.map((s) => s.productionId))) {
    const byPerformer = new Map<string, ConsentForGate[]>();
    for (const c of consents) {
      if (c.productionId !== null && c.productionId !== productionId) continue;
      const list = byPerformer.get(c.performerId) ?? [];
      list.push(c);
      byPerformer.set(c.performerId, list);
    }
    const due = sessions.filter((s) => s.status === 'booked' && s.productionId === productionId);
    for (const m of bookingsMissingConsent(due, byPerformer)) missing.add(m.booking.id);
  }
  return missing;
}

/**
 * How long a calendar holds for a session that records no end of its own. A patch-test appointment is the
 * application only (the readings are their own visits); a face life cast with set-up, casting and clean-up
 * takes a morning; a full prosthetic application is a few hours before call.
 */
// common practice, no published source
export const DEFAULT_SESSION_MINUTES: Record<BookingPurpose, number> = {
  patch_test: 30,
  life_cast: 180,
  application: 150,
};

/** When a session ends on the calendar: its own end when it records one, else its start plus the usual length. */
export function sessionEnd(purpose: BookingPurpose, startsAt: Date, endsAt?: Date | null): Date {
  return endsAt ?? new Date(startsAt.getTime() + DEFAULT_SESSION_MINUTES[purpose] * 60_000);
}
