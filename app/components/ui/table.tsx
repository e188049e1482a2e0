import { useId, useLayoutEffect, useRef, useState, type ReactNode, type TdHTMLAttributes, type ThHTMLAttributes } from 'react';

/** Below this width a list always reads as cards; above it, as a table whenever the table fits. */
export const STACK_BELOW_PX = 560;
/** A table stays a table while its narrowest layout takes at most this share of the box. */
const SQUEEZE_LIMIT = 0.8;

/** The words of a header cell, without the decorative sort arrows. */
function headerWords(th: Element): string {
  const copy = th.cloneNode(true) as Element;
  // Decorative arrows and words meant for screen readers only (an "Actions" column) are not a label.
  for (const hidden of copy.querySelectorAll('[aria-hidden="true"], .sr-only')) hidden.remove();
  return (copy.textContent ?? '').replace(/\s+/g, ' ').trim();
}

function setRole(el: Element, role: string) {
  if (el.getAttribute('role') !== role) el.setAttribute('role', role);
}

/** Gives every body cell the words of its column header, which the card layout prints beside it. */
function labelCells(table: HTMLTableElement) {
  // Explicit roles: a table laid out as cards (display: block) keeps its table semantics in every browser.
  setRole(table, 'table');
  if (table.tHead) setRole(table.tHead, 'rowgroup');
  for (const body of table.tBodies) setRole(body, 'rowgroup');
  for (const row of table.rows) {
    setRole(row, 'row');
    for (const cell of row.cells) setRole(cell, cell.tagName === 'TH' ? (cell.getAttribute('scope') === 'row' ? 'rowheader' : 'columnheader') : 'cell');
  }
  const headRow = table.tHead?.rows[0];
  if (!headRow) return;
  const labels: string[] = [];
  for (const th of headRow.cells) {
    const words = headerWords(th);
    for (let i = 0; i < Math.max(1, th.colSpan); i++) labels.push(words);
  }
  for (const body of table.tBodies) {
    for (const row of body.rows) {
      let col = 0;
      for (const cell of row.cells) {
        const label = labels[col] ?? '';
        if (cell.getAttribute('data-label') !== label) cell.setAttribute('data-label', label);
        col += Math.max(1, cell.colSpan);
      }
    }
  }
}

/**
 * Table or cards: a table while it fits its box with room to spare, stacked label/value cards when
 * it would not (or when the box is narrower than STACK_BELOW_PX). Measured before paint, so it never flickers and a
 * list never scrolls sideways, whatever its columns or the screen.
 */
function useStacking() {
  const box = useRef<HTMLDivElement>(null);
  const table = useRef<HTMLTableElement>(null);
  const [stacked, setStacked] = useState(false);
  useLayoutEffect(() => {
    const boxEl = box.current;
    const tableEl = table.current;
    if (!boxEl || !tableEl) return;
    const decide = () => {
      labelCells(tableEl);
      const width = boxEl.clientWidth;
      // Measure the table as a table, whatever it shows now; restored before the browser paints.
      const was = tableEl.getAttribute('data-stacked');
      tableEl.removeAttribute('data-stacked');
      // Its narrowest layout: every column squeezed to its longest word (or its unbreakable badge).
      tableEl.style.width = 'min-content';
      const narrowest = tableEl.offsetWidth;
      tableEl.style.width = '';
      if (was !== null) tableEl.setAttribute('data-stacked', was);
      // A table that only fits squeezed to nearly that reads a word a line: cards read better.
      const fits = width >= STACK_BELOW_PX && narrowest <= width * SQUEEZE_LIMIT;
      setStacked(!fits);
    };
    decide();
    const resize = new ResizeObserver(decide);
    resize.observe(boxEl);
    // New rows (another page, a sort, a filter) may be wider or narrower than the last.
    const mutation = new MutationObserver(decide);
    mutation.observe(tableEl, { childList: true, subtree: true, characterData: true });
    return () => {
      resize.disconnect();
      mutation.disconnect();
    };
  }, []);
  return { box, table, stacked };
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

/**
 * Every list's table. Columns get their labels from the header row, so a list only writes
 * <Thead>, <Th> and <Td>; on a narrow screen each row becomes a card of label/value lines, its
 * first cell as the card's title and columns with an empty header (actions) along its foot.
 */
export function Table({ caption, captionHidden = false, busy = false, children, testId }: TableProps) {
  const captionId = useId();
  const { box: boxRef, table: tableRef, stacked } = useStacking();
  return (
    <div ref={boxRef} className="plinth-table-box w-full min-w-0 rounded-xl border border-plaster-300 bg-white" data-table-box="">
      <table
        ref={tableRef}
        className={`plinth-table w-full border-collapse text-left text-base transition-opacity ${busy ? 'opacity-60' : ''}`}
        aria-busy={busy || undefined}
        aria-labelledby={captionId}
        data-testid={testId}
        data-stacked={stacked ? '' : undefined}
      >
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
    <th scope="col" className={`px-4 py-2 align-bottom font-semibold whitespace-nowrap ${className}`} {...rest}>
      {children}
    </th>
  );
}

// Cells sit on the row's middle, so a 44 px link and a line of text in the same row line up.
export function Td({ className = '', children, ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return (
    <td className={`px-4 py-2 align-middle ${className}`} {...rest}>
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

/** A column header that sorts: a real button, with aria-sort telling the current order. It stays on the cards too. */
export function SortHeader<K extends string>({ label, sortKey, sort, dir, onSort, className = '' }: SortHeaderProps<K>) {
  const active = sort === sortKey;
  const nextDir: SortDir = active && dir === 'asc' ? 'desc' : 'asc';
  return (
    <th scope="col" aria-sort={active ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'} className={`px-2 py-1 align-bottom font-semibold ${className}`} data-sortable="">
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
