import { governingStorageConsent, retentionStatus, type RetentionStatus } from '#shared/domain/archive-retention.ts';
import type { Actor } from '#shared/policy.ts';
import type { Retention, RetentionList } from '#shared/schemas/archive.ts';
import type { Db } from '../../db/index.ts';
import { storageConsentTimes } from '../consents/index.ts';
import { castScope, toListItem } from './cast-view.ts';
import { listHeldCasts, type CastRecord } from './repo-casts.ts';
import { listLocations } from './repo-locations.ts';

/**
 * Each cast's retention: the storage consents that cover it are its performer's, given to the
 * cast's own production or naming none; the archive's rules pick the one that speaks now.
 */
export async function retentionOf(db: Db, casts: readonly Pick<CastRecord, 'id' | 'performerId' | 'productionId' | 'status'>[], now: Date): Promise<Map<string, RetentionStatus>> {
  const consents = await storageConsentTimes(
    db,
    casts.map((c) => c.performerId),
  );
  const out = new Map<string, RetentionStatus>();
  for (const cast of casts) {
    const covering = consents.filter((c) => c.performerId === cast.performerId && (c.productionId === null || c.productionId === cast.productionId));
    out.set(cast.id, retentionStatus(cast, governingStorageConsent(covering, now), now));
  }
  return out;
}

export function retentionView(r: RetentionStatus): Retention {
  return { state: r.state, reason: r.reason, reviewOn: r.reviewOn?.toISOString() ?? null };
}

/** Casts the actor may read whose retention has ended or ends soon, most urgent first. */
export async function retentionList(db: Db, actor: Actor, now = new Date()): Promise<RetentionList> {
  const casts = await listHeldCasts(db, castScope(actor, 'casts.read'));
  const [status, tree] = await Promise.all([retentionOf(db, casts, now), listLocations(db)]);
  const rows = casts.map((cast) => ({ cast: toListItem(cast, tree, now), retention: retentionView(status.get(cast.id)!) }));
  const byDate = (a: (typeof rows)[number], b: (typeof rows)[number]) => (a.retention.reviewOn ?? '').localeCompare(b.retention.reviewOn ?? '') || a.cast.labelCode.localeCompare(b.cast.labelCode);
  return {
    due: rows.filter((r) => r.retention.state === 'due').sort(byDate),
    soon: rows.filter((r) => r.retention.state === 'review_soon').sort(byDate),
  };
}
