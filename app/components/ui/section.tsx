import { useId, type ReactNode } from 'react';

/** A titled card; the section is named by its h2 so landmarks and headings agree. */
export function Section({ title, children, actions, testId }: { title: ReactNode; children: ReactNode; actions?: ReactNode; testId?: string }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="flex flex-col gap-4 rounded-2xl border border-plaster-300 bg-white p-4 sm:p-6" data-testid={testId}>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id={id} className="text-xl font-bold text-graphite-900">
          {title}
        </h2>
        {actions}
      </div>
      {children}
    </section>
  );
}
