/** A moment as the date-and-time box shows it, in the device's own time zone ("2027-03-01T09:30"). */
export function localInputValue(at: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${at.getFullYear()}-${pad(at.getMonth() + 1)}-${pad(at.getDate())}T${pad(at.getHours())}:${pad(at.getMinutes())}`;
}

/** Today's date in the device's time zone (YYYY-MM-DD). */
export function localDate(at: Date): string {
  return localInputValue(at).slice(0, 10);
}
