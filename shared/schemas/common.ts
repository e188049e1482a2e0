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
