import { z } from 'zod';

/** One read of a performer's health details, as the performer and the lead see it. */
export const HealthReadSchema = z.object({
  at: z.iso.datetime(),
  /** The person who read (null once their user record is gone). */
  who: z.string().nullable(),
  /** What was read, in words. */
  what: z.string(),
});
export const HealthReadListSchema = z.object({ items: z.array(HealthReadSchema) });
export type HealthRead = z.infer<typeof HealthReadSchema>;
