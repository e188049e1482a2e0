import { useEffect, useRef, type ReactNode } from 'react';
import { useLocation } from 'react-router-dom';
import { useDocumentTitle } from '../../lib/use-document-title.ts';

interface PageHeadingProps {
  children: ReactNode;
  /** The tab title ("Users" → "Users · Plinth"). */
  title: string;
  /** A line under the heading. */
  lead?: ReactNode;
  actions?: ReactNode;
  testId?: string;
}

/**
 * The page's one h1. After moving to another page it takes focus, so keyboard and screen-reader
 * users start at the new content; a change of search or sort (same path) leaves focus alone.
 */
export function PageHeading({ children, title, lead, actions, testId }: PageHeadingProps) {
  const ref = useRef<HTMLHeadingElement>(null);
  const shownFor = useRef<string | null>(null);
  const { pathname, key } = useLocation();
  useDocumentTitle(title);

  useEffect(() => {
    if (shownFor.current === pathname) return;
    shownFor.current = pathname;
    // "default" is the key of the very first page load, where focus should stay at the top.
    if (key !== 'default') ref.current?.focus();
  }, [pathname, key]);

  return (
    <div className="flex flex-wrap items-end justify-between gap-4">
      <div className="flex flex-col gap-1">
        <h1 ref={ref} tabIndex={-1} className="text-3xl font-bold text-graphite-900" data-testid={testId}>
          {children}
        </h1>
        {lead ? <p className="max-w-prose text-graphite-700">{lead}</p> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-3">{actions}</div> : null}
    </div>
  );
}
