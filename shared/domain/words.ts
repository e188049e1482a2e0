/** Dates as people read them in a letter: weekday, day, month in words, year, and the clock time where it matters. */

/** "Wednesday 9 December 2026", read on the studio's clock. */
export function dateInWords(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }).formatToParts(at);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  return `${part('weekday')} ${part('day')} ${part('month')} ${part('year')}`;
}

/** "Wednesday 9 December 2026 at 14:30", read on the studio's clock. */
export function dateTimeInWords(at: Date, timeZone: string): string {
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(at);
  return `${dateInWords(at, timeZone)} at ${time}`;
}

/** "A, B and C": names in a sentence. */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items[0] ?? '';
  return `${items.slice(0, -1).join(', ')} and ${items.at(-1)}`;
}

/** The same words with the first letter in capitals, to open a sentence. */
export function capitalised(words: string): string {
  return words.charAt(0).toUpperCase() + words.slice(1);
}
