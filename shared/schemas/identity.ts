import { z } from 'zod';

/** What a confirmation link shows: whose address it confirms. */
export const EmailConfirmationViewSchema = z.object({ performerName: z.string(), email: z.string() });
export type EmailConfirmationView = z.infer<typeof EmailConfirmationViewSchema>;

/** What an invitation to link a sign-in shows before it is accepted. */
export const AccountInvitationViewSchema = z.object({ performerName: z.string() });
export type AccountInvitationView = z.infer<typeof AccountInvitationViewSchema>;

export const AccountInvitationAcceptedSchema = z.object({ performerId: z.uuid() });

/** A confirmation request or an invitation went out; `sentTo` names the address. */
export const IdentityMailSentSchema = z.object({ sentTo: z.string(), mailed: z.boolean() });
export type IdentityMailSent = z.infer<typeof IdentityMailSentSchema>;
