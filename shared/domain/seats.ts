import type { ActingRole, Actor } from '../policy.ts';

export interface Seat {
  productionId: string | null;
  productionName: string | null;
  role: ActingRole;
}

const ROLE_ORDER: ActingRole[] = ['lead', 'head', 'artist', 'archivist', 'performer'];

/** Every way a person can act: studio admin first, then per production, the lead seat before the others. */
export function seatsFor(actor: Actor, productionNames: ReadonlyMap<string, string>): Seat[] {
  const seats: Seat[] = [];
  if (actor.isAdmin) seats.push({ productionId: null, productionName: null, role: 'admin' });
  const byProduction = new Map<string, Set<ActingRole>>();
  for (const m of actor.memberships) (byProduction.get(m.productionId) ?? byProduction.set(m.productionId, new Set()).get(m.productionId)!).add(m.role);
  for (const p of actor.leadOf) (byProduction.get(p) ?? byProduction.set(p, new Set()).get(p)!).add('lead');
  const productions = [...byProduction.keys()].sort((a, b) =>
    (productionNames.get(a) ?? a).localeCompare(productionNames.get(b) ?? b),
  );
  for (const productionId of productions) {
    const roles = byProduction.get(productionId)!;
    for (const role of ROLE_ORDER) {
      if (roles.has(role)) seats.push({ productionId, productionName: productionNames.get(productionId) ?? null, role });
    }
  }
  return seats;
}

const DEFAULT_RANK: ActingRole[] = ['admin', 'lead', 'head', 'artist', 'archivist', 'performer'];

/**
 * The seat to act in: the one asked for if the person still holds it (with only a production asked
 * for, their most responsible seat on it), otherwise their most responsible one overall
 * (admin, then lead, head, artist, archivist, performer), so nobody starts in a lesser role by accident.
 */
export function chooseSeat(seats: readonly Seat[], wanted: { productionId: string | null; role?: string } | undefined): Seat | null {
  if (wanted?.role) {
    const hit = seats.find((s) => s.productionId === wanted.productionId && s.role === wanted.role);
    if (hit) return hit;
  }
  // A production with no role (the one last worked on): the best seat there. A seat no longer held: the best overall.
  const onWanted = wanted && !wanted.role ? seats.filter((s) => s.productionId === wanted.productionId) : [];
  for (const list of [onWanted, seats]) {
    for (const role of DEFAULT_RANK) {
      const hit = list.find((s) => s.role === role);
      if (hit) return hit;
    }
  }
  return null;
}

/**
 * The seat chooseSeat picks, worked out from the actor alone when production names cannot change the
 * answer: a held seat asked for, the best seat on a production asked for, or a best role held on one
 * production only. Undefined when two productions tie and their names (the order seats are listed in)
 * decide; null when the person has no seat. The seat carries no production name.
 */
export function chooseSeatByRoles(actor: Actor, wanted: { productionId: string | null; role?: string } | undefined): Seat | null | undefined {
  const seats = seatsFor(actor, new Map());
  const chosen = chooseSeat(seats, wanted);
  if (!chosen) return null;
  if (wanted && chosen.productionId === wanted.productionId) return chosen;
  return seats.filter((s) => s.role === chosen.role).length === 1 ? chosen : undefined;
}
