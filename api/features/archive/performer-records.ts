import type { CurrentPlace } from '#shared/domain/archive-casts.ts';
import { MOVEMENT_KIND_LABELS } from '#shared/domain/archive-movements.ts';
import type { Db } from '../../db/index.ts';
import { ownWhere } from './cast-service.ts';
import { listCastsOfPerformer } from './repo-casts.ts';
import { listMovements } from './repo-history.ts';
import { listLocations } from './repo-locations.ts';

/** A place in a cast's history as the performer reads it: a holder in the department is not named. */
function placeWords(place: CurrentPlace, label: string): string {
  return place.kind === 'person' ? 'Out of the store with the department' : label;
}

/**
 * A performer's casts for their records export: what each is, where it is kept now, and every move
 * it has made (when, from where to where, why), without the staff's records of who moved it.
 */
export async function castRecordsOfPerformer(db: Db, performerId: string) {
  const [casts, tree] = await Promise.all([listCastsOfPerformer(db, performerId), listLocations(db)]);
  const out = [];
  // A performer has a handful of casts: one history read each.
  for (const c of casts) {
    const moves = await listMovements(db, c.id);
    out.push({
      label: c.labelCode,
      production: c.productionName,
      region: c.region,
      kind: c.kind,
      material: c.material,
      madeOn: c.madeOn,
      madeBy: c.madeBy,
      status: c.status,
      where: ownWhere(c, tree),
      notes: c.notes,
      movements: moves.map((m) => ({
        at: m.at.toISOString(),
        kind: m.kind,
        what: MOVEMENT_KIND_LABELS[m.kind],
        from: placeWords(m.from, m.fromLabel),
        to: placeWords(m.to, m.toLabel),
        statusBefore: m.statusBefore,
        statusAfter: m.statusAfter,
        reason: m.reason,
        dueBackAt: m.dueBackAt?.toISOString() ?? null,
      })),
    });
  }
  return out;
}
