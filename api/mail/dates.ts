/**
 * The one way Plinth's e-mails write a moment: in words, on the studio's clock, naming the clock
 * ("Wednesday 2 December 2026 at 16:02, London time"), never an HTTP date. Built from parts, so the
 * words do not shift with the ICU version Node ships.
 */
export function mailDateTime(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-GB', {
    weekday: 'long',
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZone,
  }).formatToParts(at);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  const place = timeZone === 'UTC' || timeZone === 'Etc/UTC' ? 'UTC' : `${(timeZone.split('/').at(-1) ?? timeZone).replace(/_/g, ' ')} time`;
  return `${part('weekday')} ${part('day')} ${part('month')} ${part('year')} at ${part('hour')}:${part('minute')}, ${place}`;
}
