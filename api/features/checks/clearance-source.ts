import type { ClearanceResult } from '#shared/domain/clearance.ts';
import type { Db } from '../../db/index.ts';
import { performerClearances } from '../patch-tests/index.ts';

/**
 * The clearance answers the check shows: products at their current formulation, and the exact
 * formulations appliance pieces were made with, from the patch-test log's fixed set of queries.
 */
export async function clearancesFor(db: Db, q: { performerId: string; productIds: readonly string[]; formulationIds: readonly string[]; now: Date }): Promise<ClearanceResult[]> {
  return performerClearances(db, { performerId: q.performerId, productIds: q.productIds, formulationIds: q.formulationIds, now: q.now });
}
