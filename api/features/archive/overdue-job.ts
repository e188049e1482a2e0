import { BODY_REGION_LABELS, CAST_KIND_LABELS } from '#shared/domain/archive-casts.ts';
import { daysOverdue } from '#shared/domain/archive-movements.ts';
import { recordEvent } from '../../http/audit.ts';
import { dayIn, defineJob } from '../../jobs/define.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findDepartment, mailFooter } from '../productions/index.ts';
import { findUserById } from '../users/index.ts';
import { listOverdueCasts } from './repo-casts.ts';

/**
 * Once a day, each person holding a cast past its due-back time gets one e-mail about it: one per
 * cast per day, however many runs, restarts or API processes there are.
 */
export const overdueRemindersJob = defineJob({
  name: 'archive-overdue-reminders',
  summary: 'E-mails each person holding an overdue cast, once a day per cast',
  schedule: { cron: '0 8 * * *' },
  async run({ ctx, startedAt, timeZone, once }) {
    const day = dayIn(timeZone, startedAt);
    const failed: string[] = [];
    for (const cast of await listOverdueCasts(ctx.db, startedAt, null)) {
      // A loan's contact may be outside Plinth; a check-out to someone signed in to Plinth is mailed.
      if (cast.status !== 'checked_out' || !cast.currentHolderUserId || !cast.dueBackAt) continue;
      const holder = await findUserById(ctx.db, cast.currentHolderUserId);
      if (!holder) continue;
      const what = `${BODY_REGION_LABELS[cast.region].toLowerCase()} ${CAST_KIND_LABELS[cast.kind].toLowerCase()}`;
      const late = daysOverdue(cast, startedAt);
      const dep = await findDepartment(ctx.db, cast.productionId);
      try {
        await once(`archive-overdue:${cast.id}:${day}`, async () => {
          const result = await deliverAll(ctx, [
            {
              to: holder.email,
              subject: `Cast ${cast.labelCode} is overdue back at the store`,
              text: [
                `Hello ${holder.displayName},`,
                '',
                `You checked out cast ${cast.labelCode} (${what}, ${cast.productionName}). It was due back on ${mailDateTime(cast.dueBackAt!, timeZone)}${late > 0 ? ` (${late} day${late === 1 ? '' : 's'} ago)` : ''}.`,
                'Please bring it back to the store, or ask the archivist for a new due-back date.',
                '',
                `The cast in Plinth: ${ctx.config.appOrigin}/archive/casts/${cast.id}`,
                ...mailFooter(dep),
              ].join('\n'),
            },
          ]);
          if (result.failed.length) throw new Error(`reminder for ${cast.labelCode} not sent`);
          await recordEvent(ctx.db, { actorUserId: null, action: 'cast.overdue_reminder', entityType: 'cast', entityId: cast.id, productionId: cast.productionId, details: { to: holder.id, day } });
        });
      } catch {
        failed.push(cast.labelCode);
      }
    }
    // The run is tried again later; the reminders already sent keep their keys and are not repeated.
    if (failed.length) throw new Error(`overdue reminders not sent for ${failed.join(', ')}`);
  },
});
