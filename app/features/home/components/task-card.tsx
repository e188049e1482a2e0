import { useId } from 'react';
import { Link } from 'react-router-dom';
import type { Home } from '#shared/schemas/session.ts';
import { formatDateTime, formatNumber } from '../../../lib/format.ts';

type Task = Home['tasks'][number];

/** Only same-site paths become router links; anything else is shown without one. */
function isAppPath(href: string): boolean {
  return /^\/(?!\/)/.test(href) && !href.startsWith('/api/');
}

/**
 * A task card. Its four parts (title, count, words, list) sit on the rows of the grid around it
 * (subgrid), so the counts of cards side by side line up whatever the length of their titles.
 */
export function TaskCard({ task }: { task: Task }) {
  const titleId = useId();
  const attention = task.count > 0;
  return (
    <article
      aria-labelledby={titleId}
      data-testid="task-card"
      data-task={task.id}
      className={`row-span-4 grid grid-rows-subgrid gap-2 rounded-2xl border bg-white p-5 ${attention ? 'border-verdigris-600' : 'border-plaster-300'}`}
    >
      <h2 id={titleId} className="self-start text-lg font-bold text-graphite-900">
        {task.href && isAppPath(task.href) ? (
          <Link to={task.href} className="inline-flex min-h-11 items-center underline decoration-2 hover:text-verdigris-900">
            {task.title}
          </Link>
        ) : (
          <span className="inline-flex min-h-11 items-center">{task.title}</span>
        )}
      </h2>
      <p className="text-4xl font-bold text-verdigris-800" data-testid="task-count">
        {formatNumber(task.count)}
      </p>
      <p className="text-graphite-700">{task.detail}</p>
      {task.items?.length ? (
        <ul className="flex flex-col gap-1 text-graphite-900" data-testid="task-items">
          {task.items.map((item, i) => (
            <li key={`${item.label}-${i}`}>
              <span className="font-semibold">{item.label}</span>
              {item.at ? (
                <>
                  {' · '}
                  <time dateTime={item.at}>{formatDateTime(item.at)}</time>
                </>
              ) : null}
            </li>
          ))}
        </ul>
      ) : (
        <span aria-hidden="true" />
      )}
    </article>
  );
}
