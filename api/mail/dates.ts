import { dateInWords, dateTimeInWords } from '#shared/domain/words.ts';

/** "London time", "UTC": the studio's clock, named so a reader elsewhere knows which clock a time is on. */
function clockName(timeZone: string): string {
  return timeZone === 'UTC' || timeZone === 'Etc/UTC' ? 'UTC' : `${(timeZone.split('/').at(-1) ?? timeZone).replace(/_/g, ' ')} time`;
}

/**
 * The one way Plinth's e-mails write a moment: in words, on the studio's clock, naming the clock
 * ("Wednesday 2 December 2026 at 16:02, London time"), never an HTTP date or an ISO string.
 */
export function mailDateTime(at: Date, timeZone: string): string {
  return `${dateTimeInWords(at, timeZone)}, ${clockName(timeZone)}`;
}

/** A day in an e-mail, read on the studio's clock: "Wednesday 2 December 2026". */
export function mailDate(at: Date, timeZone: string): string {
  return dateInWords(at, timeZone);
}
