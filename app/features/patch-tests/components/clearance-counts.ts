import type { ClearanceState } from '#shared/domain/clearance.ts';

/** The states the summary line counts, what stops an application first; Untested is every product not listed. */
export const COUNTED_STATES = ['do_not_use', 'caution', 'pending', 'cleared'] as const satisfies readonly ClearanceState[];
export type CountedState = (typeof COUNTED_STATES)[number];

/**
 * How many listed products are in each counted state (a listed Untested row is counted with every other
 * product). The products Caution only for sharing an ingredient with a reaction come as a count.
 */
export function countClearances(rows: readonly { state: ClearanceState }[], sharedCautions = 0): Record<CountedState, number> {
  const counts: Record<CountedState, number> = { do_not_use: 0, caution: sharedCautions, pending: 0, cleared: 0 };
  for (const r of rows) if (r.state !== 'untested') counts[r.state] += 1;
  return counts;
}
