import { CONSENT_KINDS, consentState, coversMoment, type ConsentKind, type ConsentTimes } from './consent.ts';

/** How soon an end of cover counts as "expiring": the same 30 days the department's home counts. */
export const EXPIRING_WITHIN_DAYS = 30;
const DAY_MS = 86_400_000;

/** Cover of one kind of consent: in force, in force but ending soon, or missing (never signed, expired or withdrawn). */
export type KindCover = { kind: ConsentKind; cover: 'in_force' } | { kind: ConsentKind; cover: 'expiring'; endsAt: Date } | { kind: ConsentKind; cover: 'missing' };

export interface SummaryConsent extends ConsentTimes {
  kind: ConsentKind;
  productionId: string | null;
}

/**
 * The one-line consent summary staff act on: for each kind, whether a consent covers today on this
 * production (one given to it, or naming none), and whether that cover ends within 30 days. Several
 * consents of a kind: the one that runs longest decides.
 */
export function summarizeConsents(consents: readonly SummaryConsent[], now: Date, productionId: string | null): KindCover[] {
  const limit = now.getTime() + EXPIRING_WITHIN_DAYS * DAY_MS;
  return CONSENT_KINDS.map((kind): KindCover => {
    const covering = consents.filter(
      (c) => c.kind === kind && (productionId === null || c.productionId === null || c.productionId === productionId) && coversMoment(c, now) && consentState(c, now) === 'active',
    );
    if (covering.length === 0) return { kind, cover: 'missing' };
    if (covering.some((c) => c.expiresAt === null)) return { kind, cover: 'in_force' };
    const endsAt = new Date(Math.max(...covering.map((c) => c.expiresAt!.getTime())));
    return endsAt.getTime() <= limit ? { kind, cover: 'expiring', endsAt } : { kind, cover: 'in_force' };
  });
}
