import { z } from 'zod';
import { PRODUCTION_ROLES } from '../policy.ts';
import { IdSchema } from './common.ts';

export const ProductionRoleSchema = z.enum(PRODUCTION_ROLES);
export const ActingRoleSchema = z.enum([...PRODUCTION_ROLES, 'lead', 'admin']);

export const SessionUserSchema = z.object({
  id: IdSchema,
  email: z.string(),
  displayName: z.string(),
  isAdmin: z.boolean(),
});

/** One way this person can act: a role on a production (or studio admin, with no production). */
export const SessionSeatSchema = z.object({
  productionId: IdSchema.nullable(),
  productionName: z.string().nullable(),
  role: ActingRoleSchema,
});
export type SessionSeat = z.infer<typeof SessionSeatSchema>;

export const SessionSchema = z.object({
  user: SessionUserSchema,
  memberships: z.array(z.object({ productionId: IdSchema, role: ProductionRoleSchema })),
  leadOf: z.array(IdSchema),
  performerIds: z.array(IdSchema),
  seats: z.array(SessionSeatSchema),
  current: SessionSeatSchema.nullable(),
});
export type Session = z.infer<typeof SessionSchema>;

export const SelectSeatInputSchema = z.object({
  productionId: IdSchema.nullable(),
  role: ActingRoleSchema,
});
export type SelectSeatInput = z.infer<typeof SelectSeatInputSchema>;

export const LogoutResultSchema = z.object({ redirectTo: z.string() });

/** One named thing under a task (a performer and their session's time); the client words the date. */
export const HomeTaskItemSchema = z.object({
  label: z.string(),
  at: z.iso.datetime().nullable(),
});
export const HomeTaskSchema = z.object({
  id: z.string(),
  title: z.string(),
  detail: z.string(),
  count: z.number().int(),
  href: z.string().nullable(),
  items: z.array(HomeTaskItemSchema).optional(),
});
export const HomeSchema = z.object({
  role: ActingRoleSchema,
  productionId: IdSchema.nullable(),
  tasks: z.array(HomeTaskSchema),
});
export type Home = z.infer<typeof HomeSchema>;

export const HealthSchema = z.object({ status: z.enum(['ok', 'degraded']), database: z.enum(['ok', 'unreachable']) });
