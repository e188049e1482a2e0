import { ROLE_LABELS, type ActingRole } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findDepartment, mailFooter } from './department.ts';
import { findHeads } from './repo.ts';

/** Tells a person they were given a role. Sent after the change is committed; a failed send is logged, not fatal. */
export async function sendRoleNotice(ctx: AppContext, to: { email: string; displayName: string }, role: ActingRole, productionId: string, productionName: string): Promise<void> {
  const label = ROLE_LABELS[role];
  const dep = await findDepartment(ctx.db, productionId);
  const text = [
    `Hello ${to.displayName},`,
    '',
    `You now have the role "${label}" on ${productionName} in Plinth, since ${mailDateTime(new Date(), ctx.config.timeZone)}.`,
    `Sign in at ${ctx.config.appOrigin}/ to see what needs doing.`,
    '',
    'If you did not expect this, tell your studio administrator.',
    ...mailFooter(dep),
  ].join('\n');
  await deliverAll(ctx, [{ to: to.email, subject: `Plinth: you are now ${label} on ${productionName}`, text }]);
}

/** Every change of designated lead is told to the production's heads: they should know who reads health data. */
export async function sendLeadChangeToHeads(ctx: AppContext, productionId: string, productionName: string, sentence: string): Promise<void> {
  const [heads, dep] = await Promise.all([findHeads(ctx.db, productionId), findDepartment(ctx.db, productionId)]);
  const when = mailDateTime(new Date(), ctx.config.timeZone);
  await deliverAll(
    ctx,
    heads.map((h) => ({
      to: h.email,
      subject: `Plinth: the designated lead on ${productionName} changed`,
      text: [
        `Hello ${h.name},`,
        '',
        `${sentence} This took effect on ${when}.`,
        'The designated lead is the only member of staff who sees performers’ health details on this production.',
        '',
        'If you did not expect this, tell your studio administrator.',
        ...mailFooter(dep),
      ].join('\n'),
    })),
  );
}
