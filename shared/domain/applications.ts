/** Rules of the application log: lots that may go on a performer, times, the skin check after removal, and a stale check. */
import type { ClearanceResult, ClearanceState } from './clearance.ts';

/** What the artist sees after removal: clear, or redness or a reaction with an observation. */
export const SKIN_CHECK_OUTCOMES = ['clear', 'redness', 'reaction'] as const;
/** One skin-check outcome. */
export type SkinCheckOutcome = (typeof SKIN_CHECK_OUTCOMES)[number];

/** Outcomes in plain words. */
export const SKIN_CHECK_OUTCOME_LABELS: Record<SkinCheckOutcome, string> = {
  clear: 'Clear',
  redness: 'Redness',
  reaction: 'Reaction',
};

/** Anything but clear is reported to the designated lead as an incident. */
export function opensIncident(outcome: SkinCheckOutcome): boolean {
  return outcome !== 'clear';
}

/** An end before the start is refused; an open end (still on) is fine. */
export function endBeforeStart(startedAt: Date, endedAt: Date | null): boolean {
  return endedAt !== null && endedAt.getTime() < startedAt.getTime();
}

/** The parts of a clearance answer a check freezes, for comparing with a fresh one. */
export interface FrozenAnswer {
  formulationId: string;
  productName: string;
  state: ClearanceState;
}

/**
 * The products whose answer is not what the check showed: a different state now, or no answer at all
 * (the product's formulation changed, so its current one was never checked).
 */
export function changedSinceCheck(checked: readonly FrozenAnswer[], fresh: readonly Pick<ClearanceResult, 'formulationId' | 'state'>[]): FrozenAnswer[] {
  const now = new Map(fresh.map((r) => [r.formulationId, r.state]));
  return checked.filter((c) => now.get(c.formulationId) !== c.state);
}
