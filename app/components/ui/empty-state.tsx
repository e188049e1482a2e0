import type { ReactNode } from 'react';

export function EmptyState({ title, children, action }: { title: ReactNode; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="flex flex-col items-start gap-2 rounded-xl border border-dashed border-graphite-500 bg-white p-6" data-testid="empty-state">
      <p className="text-lg font-semibold text-graphite-900">{title}</p>
      {children ? <div className="text-graphite-700">{children}</div> : null}
      {action}
    </div>
  );
}
