import { useEffect, useRef } from 'react';
import { useSelectSeat } from './api.ts';
import { useSession } from './session-context.tsx';

const RANK = ['lead', 'head', 'artist', 'archivist', 'performer'] as const;

/**
 * A record that belongs to one production (a consent, a cast, a build) is read in a seat on that
 * production, so the header never names a different production from the page: when the person
 * holds a seat there (the same role if they can), the page switches to it once. The studio
 * administrator's seat names no production and is left alone.
 */
export function useRecordProduction(productionId: string | null | undefined): void {
  const session = useSession();
  const selectSeat = useSelectSeat();
  const tried = useRef<string | null>(null);
  const current = session.current;
  useEffect(() => {
    if (!productionId || !current || current.role === 'admin' || current.productionId === productionId) return;
    if (tried.current === productionId || selectSeat.isPending) return;
    const there = session.seats.filter((s) => s.productionId === productionId);
    const seat = there.find((s) => s.role === current.role) ?? RANK.map((role) => there.find((s) => s.role === role)).find(Boolean);
    if (!seat) return;
    tried.current = productionId;
    selectSeat.mutate({ productionId: seat.productionId, role: seat.role });
  }, [productionId, current, session.seats, selectSeat]);
}
