/** Calendar windows for the sessions page, by the viewer's local clock. */

/** Midnight at the start of the local day holding `at`. */
export function startOfDay(at: Date): Date {
  return new Date(at.getFullYear(), at.getMonth(), at.getDate());
}

/** Monday, local midnight, of the week holding `at` (weeks start on Monday, as ISO 8601 counts them). */
export function startOfWeek(at: Date): Date {
  const day = startOfDay(at);
  const offset = (day.getDay() + 6) % 7;
  return addDays(day, -offset);
}

/** The same local clock time `n` days on (a change of summer time keeps midnight at midnight). */
export function addDays(at: Date, n: number): Date {
  return new Date(at.getFullYear(), at.getMonth(), at.getDate() + n, at.getHours(), at.getMinutes());
}

/** The days a view shows: one, or the seven of a week from Monday. */
export function daysOf(view: 'day' | 'week', at: Date): Date[] {
  const first = view === 'day' ? startOfDay(at) : startOfWeek(at);
  return Array.from({ length: view === 'day' ? 1 : 7 }, (_, i) => addDays(first, i));
}

/** "2027-03-01T09:00", the value a datetime-local box takes, for a local day at an hour. */
export function localInputValue(day: Date, hour: number): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${day.getFullYear()}-${p(day.getMonth() + 1)}-${p(day.getDate())}T${p(hour)}:00`;
}
