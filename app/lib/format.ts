// Dates and sizes follow the reader's own locale; `undefined` picks the browser's.

const dateFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });
const dateTimeFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** "2027-03-01" is a calendar date, not an instant: build it in local time so it never shifts a day. */
export function formatDate(isoDate: string | null | undefined): string {
  if (!isoDate) return '';
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  const date = m ? new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : new Date(isoDate);
  return Number.isNaN(date.getTime()) ? isoDate : dateFormat.format(date);
}

export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : dateTimeFormat.format(date);
}

/**
 * Formats for one locale, made once: the browser's own (`undefined`) unless a screen names one, as the
 * tablet's signing screens may for the performer's language.
 */
const cache = new Map<string, Intl.DateTimeFormat>();
function dateFormatFor(kind: 'day' | 'long' | 'clock', locale: string | undefined): Intl.DateTimeFormat {
  const key = `${kind}|${locale ?? ''}`;
  let f = cache.get(key);
  if (!f) {
    const options: Intl.DateTimeFormatOptions =
      kind === 'day' ? { weekday: 'long', day: 'numeric', month: 'long' } : kind === 'long' ? { day: 'numeric', month: 'long', year: 'numeric' } : { hour: '2-digit', minute: '2-digit' };
    f = new Intl.DateTimeFormat(locale, options);
    cache.set(key, f);
  }
  return f;
}

function toDate(at: Date | string): Date | null {
  const date = typeof at === 'string' ? new Date(at) : at;
  return Number.isNaN(date.getTime()) ? null : date;
}

/** A day as a heading: weekday, day and month ("Monday 7 December" in British English). */
export function formatDayTitle(at: Date | string, locale?: string): string {
  const date = toDate(at);
  return date ? dateFormatFor('day', locale).format(date) : String(at);
}

/** A date in full words with its year ("7 December 2026" in British English). */
export function formatLongDate(at: Date | string, locale?: string): string {
  const date = toDate(at);
  return date ? dateFormatFor('long', locale).format(date) : String(at);
}

/** The time of day on the reader's clock, hours and minutes ("14:05", or "02:05 PM" in American English). */
export function formatClock(at: Date | string, locale?: string): string {
  const date = toDate(at);
  return date ? dateFormatFor('clock', locale).format(date) : String(at);
}

const number = new Intl.NumberFormat();
export function formatNumber(n: number): string {
  return number.format(n);
}

const units = ['byte', 'kilobyte', 'megabyte', 'gigabyte'] as const;
export function formatBytes(bytes: number): string {
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return new Intl.NumberFormat(undefined, {
    style: 'unit',
    unit: units[unit],
    unitDisplay: 'short',
    maximumFractionDigits: unit === 0 ? 0 : 1,
  }).format(value);
}

/** "one person" / "3 people": the counting words used in captions and pagers. */
export function plural(n: number, one: string, many: string): string {
  return `${formatNumber(n)} ${n === 1 ? one : many}`;
}
