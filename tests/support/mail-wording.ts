// How every Plinth mail reads: it names its production and department head in the closing line, writes
// its moments in words, and never carries a machine date (ISO 8601 or an HTTP date).
import { expect } from 'vitest';

const WEEKDAY = '(?:Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday)';
const MONTH = '(?:January|February|March|April|May|June|July|August|September|October|November|December)';
/** "Wednesday 2 December 2026". */
export const DATE_IN_WORDS = new RegExp(`${WEEKDAY} \\d{1,2} ${MONTH} \\d{4}`);
/** "Wednesday 2 December 2026 at 14:30, London time". */
export const MOMENT_IN_WORDS = new RegExp(`${WEEKDAY} \\d{1,2} ${MONTH} \\d{4} at \\d{2}:\\d{2}, [A-Z][A-Za-z ]+ time`);
const ISO_MOMENT = /\d{4}-\d{2}-\d{2}T/;
const HTTP_DATE = /\b(?:Mon|Tue|Wed|Thu|Fri|Sat|Sun), \d{2} (?:Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec) \d{4}|\bGMT\b/;

/** The closing line naming the production and its department head(s), as a reader sees it. */
export function departmentLine(production: string, heads: string): string {
  return `Production: ${production} · Department head${heads.includes(' and ') ? 's' : ''}: ${heads}`;
}

/** Fails unless the mail's text names the production and head, has a date in words, and no machine date. */
export function expectWordedMail(text: string | undefined | false, production = 'The Lantern Keeper', heads = 'Marta Oyelaran', opts: { dateOnly?: boolean } = {}): void {
  const body = text || '';
  expect(body, 'names the production and its head').toContain(departmentLine(production, heads));
  expect(body, 'writes a date in words').toMatch(opts.dateOnly ? DATE_IN_WORDS : MOMENT_IN_WORDS);
  expect(body, 'carries no ISO date').not.toMatch(ISO_MOMENT);
  expect(body, 'carries no HTTP date').not.toMatch(HTTP_DATE);
}
