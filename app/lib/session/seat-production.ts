import type { Session } from '#shared/schemas/session.ts';

/** The production the acting seat works on (null for the studio administrator's seat). */
export function seatProduction(session: Session): { id: string; name: string } | null {
  const seat = session.current;
  if (!seat?.productionId) return null;
  return { id: seat.productionId, name: seat.productionName ?? 'Untitled production' };
}
