import { recordEvent } from '../../http/audit.ts';
import { defineJob } from '../../jobs/define.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { findCurrentLeads, findDepartment, mailFooter } from '../productions/index.ts';
import { readingLists } from './home-tasks.ts';

/**
 * Every five minutes: the production's lead gets one e-mail as each reading window opens, and one when
 * a required reading becomes overdue, each exactly once per test and reading point, whatever the runs,
 * restarts or API processes. The mail names the performer, the reading and its window, never a result.
 */
export const readingRemindersJob = defineJob({
  name: 'patch-test-reading-reminders',
  summary: 'E-mails the lead as each patch-test reading window opens, and once when a reading becomes overdue',
  schedule: { cron: '*/5 * * * *' },
  async run({ ctx, startedAt, timeZone, once }) {
    const { dueNow, overdue } = await readingLists(ctx.db, undefined, startedAt, timeZone);
    const productionIds = [...new Set([...dueNow, ...overdue].map((t) => t.test.productionId))];
    const [leads, departments] = await Promise.all([findCurrentLeads(ctx.db, productionIds), Promise.all(productionIds.map(async (id) => [id, await findDepartment(ctx.db, id)] as const))]);
    const departmentOf = new Map(departments);
    const failed: string[] = [];
    const send = async (kind: 'open' | 'overdue', task: (typeof dueNow)[number]) => {
      const lead = leads.find((l) => l.productionId === task.test.productionId);
      if (!lead) return;
      const { test, reading } = task;
      try {
        await once(`patch-reading-${kind}:${test.id}:${reading.pointId}`, async () => {
          const subject = kind === 'open' ? `Reading open: ${reading.label} for ${test.performerName}` : `Reading overdue: ${reading.label} for ${test.performerName}`;
          const line =
            kind === 'open'
              ? `The ${reading.label} reading of ${test.performerName}'s patch test is open now, until ${mailDateTime(reading.closesAt, timeZone)}.`
              : `The ${reading.label} reading of ${test.performerName}'s patch test was due by ${mailDateTime(reading.closesAt, timeZone)} and has not been recorded.`;
          const result = await deliverAll(ctx, [{ to: lead.email, subject, text: [`Hello ${lead.name},`, '', line, '', `The test in Plinth: ${ctx.config.appOrigin}/patch-tests/${test.id}`, ...mailFooter(departmentOf.get(test.productionId) ?? [])].join('\n') }]);
          if (result.failed.length) throw new Error(`reminder for ${test.id} not sent`);
          await recordEvent(ctx.db, { actorUserId: null, action: 'patch_test.reminder', performerId: test.performerId, entityType: 'patch_test', entityId: test.id, productionId: test.productionId, details: { kind, pointId: reading.pointId } });
        });
      } catch {
        failed.push(`${test.id}:${reading.pointId}`);
      }
    };
    for (const task of dueNow) await send('open', task);
    for (const task of overdue) await send('overdue', task);
    if (failed.length) throw new Error(`reading reminders not sent for ${failed.join(', ')}`);
  },
});
