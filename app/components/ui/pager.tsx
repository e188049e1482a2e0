import { formatNumber } from '../../lib/format.ts';
import { Button } from './button.tsx';

interface PagerProps {
  page: number;
  pageSize: number;
  total: number;
  /** What the rows are, for the pager's name and count ("people", "messages"). */
  noun: string;
  onPage: (page: number) => void;
}

export function Pager({ page, pageSize, total, noun, onPage }: PagerProps) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav aria-label={`Pages of ${noun}`} className="flex flex-wrap items-center justify-between gap-3 py-3">
      <p className="text-sm text-graphite-700" aria-live="polite">
        {total === 0 ? `No ${noun}` : `${formatNumber(from)}–${formatNumber(to)} of ${formatNumber(total)} ${noun}`}
        {pages > 1 ? ` · page ${formatNumber(page)} of ${formatNumber(pages)}` : ''}
      </p>
      {pages > 1 ? (
        <div className="flex gap-2">
          <Button variant="secondary" disabled={page <= 1} onClick={() => onPage(page - 1)}>
            <span aria-hidden="true">←</span> Previous
          </Button>
          <Button variant="secondary" disabled={page >= pages} onClick={() => onPage(page + 1)}>
            Next <span aria-hidden="true">→</span>
          </Button>
        </div>
      ) : null}
    </nav>
  );
}
