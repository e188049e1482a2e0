import { z } from 'zod';

export const IdSchema = z.uuid({ message: 'Must be a valid id' });
export const IdParamsSchema = z.object({ id: IdSchema });

/** Row version for optimistic locking: a stale edit gets 409 instead of overwriting. */
export const VersionSchema = z.number().int().min(1);

export const SortDirSchema = z.enum(['asc', 'desc']);

/** Query for a server-paged table. */
export function pageQuerySchema<const S extends readonly [string, ...string[]]>(sortKeys: S) {
  return z.object({
    q: z.string().trim().max(200).optional(),
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(25),
    sort: z.enum(sortKeys).default(sortKeys[0] as S[number] as never),
    dir: SortDirSchema.default('asc'),
  });
}

export function pagedSchema<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int(),
    page: z.number().int(),
    pageSize: z.number().int(),
  });
}

export const OkSchema = z.object({ ok: z.literal(true) });

export const EmailSchema = z.email({ message: 'Enter a valid email address' }).trim().toLowerCase().max(254);
export const DisplayNameSchema = z.string().trim().min(1, 'Enter a name').max(120, 'At most 120 characters');

/** Control characters other than tab, line feed and carriage return: never part of a person's text. */
// oxlint-disable-next-line no-control-regex -- matching control characters is the point
const CONTROL_CHARS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

/** Whether a string holds a control character Plinth refuses (NUL among them). */
export function hasControlChars(s: string): boolean {
  return CONTROL_CHARS.test(s);
}

/**
 * Every string anywhere in a request value that holds a refused control character, keyed by
 * its dotted path: the same field messages as a schema failure.
 */
export function controlCharFields(value: unknown, prefix = ''): Record<string, string[]> {
  // A Map, not an object: a key named "__proto__" must be named, not set the result's prototype.
  const out = new Map<string, string[]>();
  const visit = (v: unknown, path: string, depth: number) => {
    if (depth > 20) return;
    if (typeof v === 'string') {
      if (hasControlChars(v)) out.set(path, ['Remove the control characters (such as NUL) from this text.']);
    } else if (Array.isArray(v)) {
      v.forEach((item, i) => visit(item, path ? `${path}.${i}` : String(i), depth + 1));
    } else if (v && typeof v === 'object') {
      for (const [k, item] of Object.entries(v)) {
        if (hasControlChars(k)) out.set(path || k, ['Remove the control characters (such as NUL) from this text.']);
        else visit(item, path ? `${path}.${k}` : k, depth + 1);
      }
    }
  };
  visit(value, prefix, 0);
  return Object.fromEntries(out);
}

/** A calendar date (YYYY-MM-DD) within years PostgreSQL and people both mean. */
export const CalendarDateSchema = z.iso
  .date({ message: 'Use a date like 2027-03-01' })
  .refine((d) => {
    const year = Number(d.slice(0, 4));
    return year >= 1900 && year <= 2200;
  }, 'Use a date between the years 1900 and 2200');

/** A date and time sent by a client (with its offset), within the same sane years. */
export const MomentInputSchema = z.iso
  .datetime({ offset: true, message: 'Choose a date and time' })
  .refine((d) => {
    const t = Date.parse(d);
    return Number.isFinite(t) && t >= Date.UTC(1900, 0, 1) && t < Date.UTC(2201, 0, 1);
  }, 'Choose a date and time between the years 1900 and 2200');
