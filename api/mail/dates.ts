import { dateTimeInWords } from '#shared/domain/words.ts';

/**
 * The one way Plinth's e-mails write a moment: in words, on the studio's clock, naming the clock
 * ("Wednesday 2 December 2026 at 16:02, London time"), never an HTTP date. Built from parts, so the
 * words do not shift with the ICU version Node ships.
 */
export function mailDateTime(at: Date, timeZone: string): string {
  const place = timeZone === 'UTC' || timeZone === 'Etc/UTC' ? 'UTC' : `${(timeZone.split('/').at(-1) ?? timeZone).replace(/_/g, ' ')} time`;
  return `${dateTimeInWords(at, timeZone)}, ${place}`;
}
