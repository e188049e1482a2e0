/**
 * A platinum silicone appliance is often demoldable in about 30 minutes at room temperature
 * (common practice, no published source); an editable starting point, never a replacement for the data sheet.
 */
export const PLATINUM_APPLIANCE_DEMOLD_MINUTES = 30;

/** The words shown beside the default demold time, so nobody takes it for the data sheet's. */
export const DEMOLD_DEFAULT_NOTE =
  'A platinum silicone appliance is often demoldable in about 30 minutes at room temperature. The material’s data sheet always wins.';

/** A demold time and where it came from: the material's data sheet, or the editable default. */
export interface DemoldTime {
  minutes: number;
  source: 'data-sheet' | 'default';
}

/** The data sheet's demold time wins whenever there is one; otherwise the editable default. */
export function demoldTime(dataSheetMinutes: number | null | undefined, defaultMinutes: number = PLATINUM_APPLIANCE_DEMOLD_MINUTES): DemoldTime {
  return dataSheetMinutes != null ? { minutes: dataSheetMinutes, source: 'data-sheet' } : { minutes: defaultMinutes, source: 'default' };
}

/** When a piece poured at a given moment may come out of its mold. */
export function demoldAt(pouredAt: Date, minutes: number): Date {
  return new Date(pouredAt.getTime() + minutes * 60_000);
}
