import { z } from 'zod';
import type { Actor } from '#shared/policy.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { AccountInvitationAcceptedSchema, AccountInvitationViewSchema, EmailConfirmationViewSchema, IdentityMailSentSchema } from '#shared/schemas/identity.ts';
import { mayActAsPerformer } from '../../auth/users.ts';
import type { AppContext } from '../../context.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { rateLimiter } from '../../http/rate-limit.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { TOKEN_PATTERN } from '../../http/tokens.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findPerformerIdentity } from './identity-repo.ts';
import { acceptInvitation, confirmEmail, inviteToSignIn, resendConfirmation, viewConfirmation, viewInvitation } from './identity-service.ts';

const TAG = 'identity';
const TokenParams = z.object({ token: z.string().regex(TOKEN_PATTERN, 'Not a valid link') });
const linkLimiter = rateLimiter({ name: 'identity-links', windowMs: 60_000, limit: 30, message: 'Too many attempts. Wait a minute and try again.' });

/** Managers of one of the performer's productions (or the studio administrator) may send these. */
async function assertMayInvite(ctx: AppContext, actor: Actor, performerId: string) {
  const p = await findPerformerIdentity(ctx.db, performerId);
  if (!p) throw notFound('That performer');
  authorize(actor, 'accounts.invite', { performerId: p.id, performerProductionIds: p.productionIds });
}

export const identityRoutes: AnyRoute[] = [
  defineRoute({
    method: 'post',
    path: '/api/performers/:id/email-confirmation',
    summary: "Send the performer's unconfirmed address its confirmation request again (at most three an hour)",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: IdentityMailSentSchema,
    errors: [403, 404, 409, 429],
    async handler({ ctx, actor, params, req }) {
      await assertMayInvite(ctx, actor, params.id);
      const { mail, sentTo } = await resendConfirmation(ctx, actor, params.id, req);
      const { failed } = await deliverAll(ctx, [mail]);
      return { sentTo, mailed: failed.length === 0 };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/performers/:id/account-invitation',
    summary: "Invite the performer to link a sign-in of their own: a one-time link to their confirmed address, which they accept signed in",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: IdentityMailSentSchema,
    errors: [403, 404, 409, 429],
    async handler({ ctx, actor, params, req }) {
      await assertMayInvite(ctx, actor, params.id);
      const { mail, sentTo } = await inviteToSignIn(ctx, actor, params.id, req);
      const { failed } = await deliverAll(ctx, [mail]);
      return { sentTo, mailed: failed.length === 0 };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/email-confirmations/:token',
    summary: 'Whose address a confirmation link confirms (nothing else)',
    tag: TAG,
    auth: 'public',
    params: TokenParams,
    response: EmailConfirmationViewSchema,
    before: [linkLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, params }) {
      return viewConfirmation(ctx.db, params.token);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/email-confirmations/:token',
    summary: 'The performer confirms the address is theirs; only then does Plinth send their mail there',
    tag: TAG,
    auth: 'public',
    params: TokenParams,
    response: EmailConfirmationViewSchema,
    before: [linkLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, params, req }) {
      return confirmEmail(ctx, params.token, req);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/account-invitations/:token',
    summary: 'Whose record an invitation to link a sign-in is for',
    tag: TAG,
    auth: 'public',
    params: TokenParams,
    response: AccountInvitationViewSchema,
    before: [linkLimiter],
    errors: [404, 409, 429],
    async handler({ ctx, params }) {
      return viewInvitation(ctx.db, params.token);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/account-invitations/:token/accept',
    summary: 'Accept an invitation with your own sign-in (never a staff one): your sign-in is linked to your performer record',
    tag: TAG,
    auth: 'session',
    params: TokenParams,
    response: AccountInvitationAcceptedSchema,
    before: [linkLimiter],
    errors: [403, 404, 409, 429],
    async handler({ ctx, actor, params, req }) {
      return acceptInvitation(ctx, actor, params.token, req, mayActAsPerformer);
    },
  }),
];
