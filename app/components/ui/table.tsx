import { useEffect, useId, useRef, useState, type ReactNode, type TdHTMLAttributes, type ThHTMLAttributes } from 'react';

/** True while the element is wider than its box, i.e. it scrolls sideways. */
function useOverflowsX<T extends HTMLElement>() {
  const ref = useRef<T>(null);
  const [overflows, setOverflows] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const check = () => setOverflows(el.scrollWidth > el.clientWidth + 1);
    check();
    const observer = new ResizeObserver(check);
    observer.observe(el);
    if (el.firstElementChild) observer.observe(el.firstElementChild);
    return () => observer.disconnect();
  }, []);
  return [ref, overflows] as const;
}

interface TableProps {
  /** The table's accessible name, shown as its caption. */
  caption: ReactNode;
  /** Keep the caption for assistive technology only, when a heading right above says the same. */
  captionHidden?: boolean;
  /** Set while a new page or sort is loading over the old rows. */
  busy?: boolean;
  children: ReactNode;
  testId?: string;
}

export function Table({ caption, captionHidden = false, busy = false, children, testId }: TableProps) {
  const captionId = useId();
  const [scrollRef, overflows] = useOverflowsX<HTMLDivElement>();
  return (
    <div
      ref={scrollRef}
      className="overflow-x-auto rounded-xl border border-plaster-300 bg-white"
      // Only a table that really scrolls becomes a keyboard stop, so it can be scrolled without a mouse.
      {...(overflows ? { tabIndex: 0, role: 'region', 'aria-labelledby': captionId } : {})}
    >
      <table className={`w-full border-collapse text-left text-base transition-opacity ${busy ? 'opacity-60' : ''}`} aria-busy={busy || undefined} data-testid={testId}>
        <caption id={captionId} className={captionHidden ? 'sr-only' : 'px-4 pt-3 pb-2 text-left text-sm font-semibold text-graphite-700'}>
          {caption}
        </caption>
        {children}
      </table>
    </div>
  );
}

export function Thead({ children }: { children: ReactNode }) {
  return <thead className="border-b border-plaster-300 bg-plaster-100 text-sm text-graphite-700">{children}</thead>;
}

export function Th({ className = '', children, ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th scope="col" className={`px-4 py-2 font-semibold whitespace-nowrap ${className}`} {...rest}>
      {children}
    </th>
  );
}

export function Td({ className = '', children, ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return (
    <td className={`px-4 py-2 align-top ${className}`} {...rest}>
      {children}
    </td>
  );
}

export function Tr({ children }: { children: ReactNode }) {
  return <tr className="border-b border-plaster-200 last:border-b-0">{children}</tr>;
}

export type SortDir = 'asc' | 'desc';

interface SortHeaderProps<K extends string> {
  label: string;
  sortKey: K;
  sort: K;
  dir: SortDir;
  onSort: (sort: K, dir: SortDir) => void;
  className?: string;
}

/** A column header that sorts: a real button, with aria-sort telling the current order. */
export function SortHeader<K extends string>({ label, sortKey, sort, dir, onSort, className = '' }: SortHeaderProps<K>) {
  const active = sort === sortKey;
  const nextDir: SortDir = active && dir === 'asc' ? 'desc' : 'asc';
  return (
    <th scope="col" aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'} className={`px-2 py-1 font-semibold ${className}`}>
      <button
        type="button"
        onClick={() => onSort(sortKey, nextDir)}
        className="inline-flex min-h-11 items-center gap-1 rounded-md px-2 font-semibold whitespace-nowrap text-graphite-900 hover:bg-plaster-200"
      >
        {label}
        <span aria-hidden="true" className={active ? 'text-verdigris-800' : 'text-graphite-500'}>
          {active ? (dir === 'asc' ? '▲' : '▼') : '↕'}
        </span>
      </button>
    </th>
  );
}
