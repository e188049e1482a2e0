import { z } from 'zod';
import { CalendarDateSchema, DisplayNameSchema, EmailSchema, IdSchema, VersionSchema, pageQuerySchema, pagedSchema } from './common.ts';
import { ProductionRoleSchema } from './session.ts';

// ---- users
export const UserSchema = z.object({
  id: IdSchema,
  email: z.string(),
  displayName: z.string(),
  isAdmin: z.boolean(),
  linked: z.boolean().describe('Has signed in at least once through the identity provider'),
  membershipCount: z.number().int(),
  createdAt: z.iso.datetime(),
  version: VersionSchema,
});
export type User = z.infer<typeof UserSchema>;

export const UserListQuerySchema = pageQuerySchema(['displayName', 'email', 'createdAt'] as const).extend({
  access: z.enum(['all', 'none']).default('all').describe('"none": users with no role anywhere yet'),
});
export type UserListQuery = z.infer<typeof UserListQuerySchema>;
export const UserPageSchema = pagedSchema(UserSchema);

export const CreateUserInputSchema = z.object({
  email: EmailSchema,
  displayName: DisplayNameSchema,
  isAdmin: z.boolean().default(false),
});
export type CreateUserInput = z.infer<typeof CreateUserInputSchema>;

export const UpdateUserInputSchema = z.object({
  displayName: DisplayNameSchema,
  isAdmin: z.boolean(),
  version: VersionSchema,
});
export type UpdateUserInput = z.infer<typeof UpdateUserInputSchema>;

// ---- productions
export const PRODUCTION_KINDS = ['film', 'television', 'stage', 'other'] as const;
export const PRODUCTION_KIND_LABELS: Record<(typeof PRODUCTION_KINDS)[number], string> = {
  film: 'Film',
  television: 'Television',
  stage: 'Stage',
  other: 'Other',
};

const DateSchema = CalendarDateSchema;

export const ProductionSchema = z.object({
  id: IdSchema,
  name: z.string(),
  kind: z.enum(PRODUCTION_KINDS),
  startsOn: z.string().nullable(),
  endsOn: z.string().nullable(),
  lead: z.object({ userId: IdSchema, displayName: z.string() }).nullable(),
  memberCount: z.number().int(),
  version: VersionSchema,
});
export type Production = z.infer<typeof ProductionSchema>;

export const ProductionListQuerySchema = pageQuerySchema(['name', 'startsOn'] as const);
export const ProductionPageSchema = pagedSchema(ProductionSchema);

const productionFields = {
  name: z.string().trim().min(1, 'Enter the production name').max(160, 'At most 160 characters'),
  kind: z.enum(PRODUCTION_KINDS, { message: 'Choose a kind' }),
  startsOn: DateSchema.nullable().default(null),
  endsOn: DateSchema.nullable().default(null),
};
function datesInOrder(v: { startsOn: string | null; endsOn: string | null }) {
  return !(v.startsOn && v.endsOn && v.endsOn < v.startsOn);
}
const datesMessage = { message: 'The end date is before the start date', path: ['endsOn'] };

export const CreateProductionInputSchema = z.object(productionFields).refine(datesInOrder, datesMessage);
export type CreateProductionInput = z.infer<typeof CreateProductionInputSchema>;
export const UpdateProductionInputSchema = z
  .object({ ...productionFields, version: VersionSchema })
  .refine(datesInOrder, datesMessage);
export type UpdateProductionInput = z.infer<typeof UpdateProductionInputSchema>;

export const MembershipSchema = z.object({
  id: IdSchema,
  userId: IdSchema,
  displayName: z.string(),
  email: z.string(),
  role: ProductionRoleSchema,
  createdAt: z.iso.datetime(),
});
export type Membership = z.infer<typeof MembershipSchema>;

export const LeadAppointmentSchema = z.object({
  id: IdSchema,
  userId: IdSchema,
  displayName: z.string(),
  startsAt: z.iso.datetime(),
  endsAt: z.iso.datetime().nullable(),
  appointedBy: z.string().nullable(),
  endedBy: z.string().nullable(),
});
export type LeadAppointment = z.infer<typeof LeadAppointmentSchema>;

export const ProductionDetailSchema = ProductionSchema.extend({
  memberships: z.array(MembershipSchema),
  leadHistory: z.array(LeadAppointmentSchema),
});
export type ProductionDetail = z.infer<typeof ProductionDetailSchema>;

export const AddMembershipInputSchema = z.object({
  userId: IdSchema,
  role: ProductionRoleSchema,
});
export type AddMembershipInput = z.infer<typeof AddMembershipInputSchema>;
export const MembershipParamsSchema = z.object({ id: IdSchema, membershipId: IdSchema });

export const AppointLeadInputSchema = z.object({
  userId: IdSchema,
  /** The production's version the admin saw, so two admins cannot appoint over each other unseen. */
  version: VersionSchema,
});
export type AppointLeadInput = z.infer<typeof AppointLeadInputSchema>;

// ---- outbox
export const OutboxMessageSchema = z.object({
  id: z.string(),
  subject: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  date: z.iso.datetime().nullable(),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), size: z.number().int() })),
});
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;
export const OutboxQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export const OutboxPageSchema = pagedSchema(OutboxMessageSchema);
export const OutboxMessageDetailSchema = OutboxMessageSchema.extend({ text: z.string() });
export type OutboxMessageDetail = z.infer<typeof OutboxMessageDetailSchema>;
/** A message Plinth could not send: who and what about, never its text or attachments. */
export const MailFailureSchema = z.object({
  id: IdSchema,
  recipients: z.string(),
  subject: z.string(),
  error: z.string(),
  attempts: z.number().int(),
  failedAt: z.iso.datetime(),
});
export type MailFailure = z.infer<typeof MailFailureSchema>;
export const MailFailureListSchema = z.object({ items: z.array(MailFailureSchema) });
export const MailRetryResultSchema = z.object({ sent: z.boolean(), error: z.string().nullable() });
export const OutboxParamsSchema = z.object({ id: z.string().regex(/^[A-Za-z0-9._-]+\.eml$/, 'Not a message id') });

// ---- audit
// The audit log's schemas live in ./audit.ts (admins and designated leads read it).
export { AuditEntrySchema, AuditPageSchema, AuditQuerySchema, type AuditEntry, type AuditPage, type AuditQuery } from './audit.ts';
