import type { Actor } from '#shared/policy.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { Db } from '../../db/index.ts';
import { castScope } from './cast-view.ts';
import { listHeldCasts, listOverdueCasts } from './repo-casts.ts';
import { retentionOf } from './retention.ts';

type Task = Home['tasks'][number];

function names(list: readonly string[], more: number): string {
  return list.join(', ') + (more > 0 ? ` and ${more} more` : '');
}

/** The archivist's day: casts out past their due-back time, and casts whose retention has ended. */
export async function archivistTasks(db: Db, actor: Actor, now = new Date()): Promise<Task[]> {
  const scope = castScope(actor, 'casts.manage');
  const [overdue, held] = await Promise.all([listOverdueCasts(db, now, scope), listHeldCasts(db, scope)]);
  const retention = await retentionOf(db, held, now);
  const due = held.filter((c) => retention.get(c.id)?.state === 'due');
  const soon = held.filter((c) => retention.get(c.id)?.state === 'review_soon');
  const holder = (c: (typeof overdue)[number]) => `${c.labelCode} (${c.currentHolder ?? c.currentProduction ?? 'out'})`;
  return [
    {
      id: 'casts-overdue',
      title: 'Overdue check-outs',
      detail: overdue.length ? `${names(overdue.slice(0, 3).map(holder), overdue.length - 3)}. Holders are e-mailed once a day.` : 'Every cast that is out is within its due-back date.',
      count: overdue.length,
      href: '/archive?overdue=true',
    },
    {
      id: 'casts-retention-due',
      title: 'Casts due for retention review',
      detail: due.length
        ? `Their storage consent has ended, was withdrawn or is missing: record their return or destruction. ${names(due.slice(0, 3).map((c) => c.labelCode), due.length - 3)}.`
        : 'Every cast held is covered by a storage consent.',
      count: due.length,
      href: '/archive/retention',
    },
    {
      id: 'casts-retention-soon',
      title: 'Storage consents ending soon',
      detail: 'Ask these performers whether to sign again, or to have their casts returned or destroyed.',
      count: soon.length,
      href: '/archive/retention',
    },
  ];
}
