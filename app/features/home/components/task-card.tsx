import { useId } from 'react';
import { Link } from 'react-router-dom';
import type { Home } from '#shared/schemas/session.ts';
import { formatNumber } from '../../../lib/format.ts';

type Task = Home['tasks'][number];

/** Only same-site paths become router links; anything else is shown without one. */
function isAppPath(href: string): boolean {
  return /^\/(?!\/)/.test(href) && !href.startsWith('/api/');
}

export function TaskCard({ task }: { task: Task }) {
  const titleId = useId();
  const attention = task.count > 0;
  return (
    <article
      aria-labelledby={titleId}
      data-testid="task-card"
      className={`flex h-full flex-col gap-2 rounded-2xl border bg-white p-5 ${attention ? 'border-clay-600' : 'border-sand-300'}`}
    >
      <h2 id={titleId} className="text-lg font-bold text-ink-900">
        {task.href && isAppPath(task.href) ? (
          <Link to={task.href} className="inline-flex min-h-11 items-center underline decoration-2 hover:text-clay-900">
            {task.title}
          </Link>
        ) : (
          task.title
        )}
      </h2>
      <p className="text-4xl font-bold text-clay-800" data-testid="task-count">
        {formatNumber(task.count)}
      </p>
      <p className="text-ink-700">{task.detail}</p>
    </article>
  );
}
