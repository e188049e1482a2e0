import { z } from 'zod';
import { CalendarDateSchema, IdSchema, pageQuerySchema, pagedSchema } from './common.ts';

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

// ---- the audit log (admins see every entry; a designated lead those of the productions they lead)

export const AuditEntrySchema = z.object({
  id: z.string(),
  at: z.iso.datetime(),
  actor: z.string().nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string().nullable(),
  productionId: IdSchema.nullable(),
  /** The production's name, so the log reads in words. */
  productionName: z.string().nullable(),
  /** Whose record the entry is about (a performer's name), when it is about one. */
  subjectName: z.string().nullable(),
  /** That performer's id, to show only the entries about them. */
  subjectPerformerId: IdSchema.nullable(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEntry = z.infer<typeof AuditEntrySchema>;

/** One event ("consent.sign") or a group of them, written as its prefix with the dot ("consent."). */
export const AuditActionFilterSchema = z
  .string()
  .max(80)
  .regex(/^[a-z_]+\.([a-z_]+)?$/, 'Name one event (consent.sign) or a group ending with a dot (consent.)');

export const AuditQuerySchema = pageQuerySchema(['at'] as const).extend({
  dir: z.enum(['asc', 'desc']).default('desc'),
  /** Free text (`q`) matches the actor's name or e-mail address, the performer's name, or a record's exact id. */
  action: AuditActionFilterSchema.optional(),
  /** Entries about this performer. */
  performer: IdSchema.optional(),
  /** Entries on this production (one the reader may review). */
  production: IdSchema.optional(),
  /** From the start of this day, on the studio's clock. */
  from: CalendarDateSchema.optional(),
  /** To the end of this day, on the studio's clock. */
  to: CalendarDateSchema.optional(),
}).refine((f) => !f.from || !f.to || f.from <= f.to, { path: ['to'], message: 'Choose a day on or after the first day' });
export type AuditQuery = z.infer<typeof AuditQuerySchema>;
export const AuditPageSchema = pagedSchema(AuditEntrySchema);
export type AuditPage = z.infer<typeof AuditPageSchema>;
