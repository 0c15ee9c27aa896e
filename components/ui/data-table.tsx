'use client';

import { useMemo, useState, type ReactNode } from 'react';
import { cx } from './cx';

export interface Column<T> {
  key: string;
  header: ReactNode;
  cell: (row: T) => ReactNode;
  /** Makes the column sortable by this value. */
  sortValue?: (row: T) => string | number | null | undefined;
  /** Numbers align right in tabular mono figures. */
  numeric?: boolean;
  /** Hide the column below a breakpoint to keep narrow screens readable. */
  hideBelow?: 'sm' | 'md' | 'lg';
  className?: string;
}

export type SortDir = 'asc' | 'desc';

export interface DataTableProps<T> {
  /** Names the table for assistive technology (visually hidden unless showCaption). */
  caption: string;
  showCaption?: boolean;
  columns: readonly Column<T>[];
  rows: readonly T[];
  rowKey: (row: T) => string;
  /** Shown instead of the table when there are no rows: say what to do next. */
  empty?: ReactNode;
  initialSort?: { key: string; dir: SortDir };
  rowClassName?: (row: T) => string | undefined;
  className?: string;
}

const hide: Record<NonNullable<Column<unknown>['hideBelow']>, string> = {
  sm: 'hidden sm:table-cell',
  md: 'hidden md:table-cell',
  lg: 'hidden lg:table-cell',
};

function compare(a: string | number | null | undefined, b: string | number | null | undefined): number {
  // Missing values sort last in both directions' natural reading.
  if (a == null && b == null) return 0;
  if (a == null) return 1;
  if (b == null) return -1;
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  return String(a).localeCompare(String(b), undefined, { numeric: true, sensitivity: 'base' });
}

function SortIcon({ dir }: { dir: SortDir | null }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 10 14" className="h-3.5 w-2.5 flex-none">
      <path d="M5 1 9 5.5H1Z" fill="currentColor" opacity={dir === 'asc' ? 1 : 0.28} />
      <path d="M5 13 1 8.5h8Z" fill="currentColor" opacity={dir === 'desc' ? 1 : 0.28} />
    </svg>
  );
}

export function DataTable<T>({ caption, showCaption, columns, rows, rowKey, empty, initialSort, rowClassName, className }: DataTableProps<T>) {
  const [sort, setSort] = useState<{ key: string; dir: SortDir } | null>(initialSort ?? null);

  const sorted = useMemo(() => {
    const col = sort && columns.find((c) => c.key === sort.key);
    if (!col?.sortValue || !sort) return rows;
    const get = col.sortValue;
    const sign = sort.dir === 'asc' ? 1 : -1;
    return rows
      .map((r, i) => ({ r, i }))
      .sort((x, y) => compare(get(x.r), get(y.r)) * sign || x.i - y.i)
      .map((x) => x.r);
  }, [rows, columns, sort]);

  if (!rows.length && empty) return <>{empty}</>;

  return (
    <div role="region" aria-label={caption} tabIndex={0} className={cx('relative overflow-x-auto rounded-lg border border-ink-200 bg-white', className)}>
      <table className="w-full border-collapse text-left text-sm">
        <caption className={showCaption ? 'px-4 py-2 text-left text-sm font-semibold text-ink-900' : 'sr-only'}>{caption}</caption>
        <thead className="border-b border-ink-200 bg-ink-50">
          <tr>
            {columns.map((c) => {
              const dir = sort?.key === c.key ? sort.dir : null;
              return (
                <th
                  key={c.key}
                  scope="col"
                  aria-sort={c.sortValue ? (dir === 'asc' ? 'ascending' : dir === 'desc' ? 'descending' : 'none') : undefined}
                  className={cx('px-3 py-2 text-xs font-semibold tracking-wide whitespace-nowrap text-ink-700 uppercase first:pl-4 last:pr-4', c.numeric && 'text-right', c.hideBelow && hide[c.hideBelow], c.className)}
                >
                  {c.sortValue ? (
                    <button
                      type="button"
                      onClick={() => setSort((s) => ({ key: c.key, dir: s?.key === c.key && s.dir === 'asc' ? 'desc' : 'asc' }))}
                      className={cx('inline-flex items-center gap-1 uppercase hover:text-ink-900', c.numeric && 'flex-row-reverse')}
                    >
                      {c.header}
                      <SortIcon dir={dir} />
                    </button>
                  ) : (
                    c.header
                  )}
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {sorted.map((row) => (
            <tr key={rowKey(row)} className={cx('align-middle hover:bg-ink-50/70', rowClassName?.(row))}>
              {columns.map((c) => (
                <td key={c.key} className={cx('px-3 py-2.5 text-ink-800 first:pl-4 last:pr-4', c.numeric && 'num text-right', c.hideBelow && hide[c.hideBelow], c.className)}>
                  {c.cell(row)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
