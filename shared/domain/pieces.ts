/** The tally of an appliance run: pieces made, worn on set, and spoiled (torn, bubbled, lost). */
export interface PiecesTally {
  made: number;
  used: number;
  spoiled: number;
}

/** Spares on top of the shoot days: so many for each day, or a set number for the whole shoot. */
export type SparesRule = { kind: 'perDay'; sparesPerDay: number } | { kind: 'total'; spares: number };

/** Whether the pieces left cover the shoot days planned and the spares, and by how many they fall short. */
export interface PiecesShortfall {
  /** Pieces the shoot days and spares call for. */
  needed: number;
  remaining: number;
  /** How many more pieces to run; 0 when the pieces left cover the plan. */
  shortBy: number;
  short: boolean;
}

/** An appliance is worn once, so a shoot day takes one piece per performer wearing it (common practice, no published source). */
export const DEFAULT_PIECES_PER_DAY = 1;

/** Pieces still on the shelf: what was made less what was worn and what was spoiled. Expects input parsed by PiecesTallySchema. */
export function piecesRemaining(tally: PiecesTally): number {
  return tally.made - tally.used - tally.spoiled;
}

/** Pieces left fall short when they are fewer than the planned shoot days need plus the spares. */
export function piecesShortfall(
  remaining: number,
  shootDaysPlanned: number,
  spares: SparesRule,
  piecesPerDay: number = DEFAULT_PIECES_PER_DAY,
): PiecesShortfall {
  const spareCount = spares.kind === 'perDay' ? spares.sparesPerDay * shootDaysPlanned : spares.spares;
  const needed = shootDaysPlanned * piecesPerDay + spareCount;
  const shortBy = Math.max(0, needed - remaining);
  return { needed, remaining, shortBy, short: shortBy > 0 };
}
