import { ROLE_LABELS, type ActingRole } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';

/** Tells a person they were given a role. Sent after the change is committed; a failed send is logged, not fatal. */
export async function sendRoleNotice(ctx: AppContext, to: { email: string; displayName: string }, role: ActingRole, productionName: string): Promise<void> {
  const label = ROLE_LABELS[role];
  const text = [
    `Hello ${to.displayName},`,
    '',
    `You now have the role "${label}" on ${productionName} in Plinth.`,
    `Sign in at ${ctx.config.appOrigin}/ to see what needs doing.`,
    '',
    'If you did not expect this, tell your studio administrator.',
  ].join('\n');
  try {
    await ctx.mailer.send({ to: to.email, subject: `Plinth: you are now ${label} on ${productionName}`, text });
  } catch (err) {
    ctx.log(`role notice to ${to.email} not sent`, err);
  }
}
