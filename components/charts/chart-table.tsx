import type { ReactNode } from 'react';
import { cx } from '@/components/ui/cx';

export interface ChartTableColumn {
  key: string;
  header: ReactNode;
  /** Right-aligned tabular figures. */
  numeric?: boolean;
}

export interface ChartTableProps {
  caption: string;
  columns: readonly ChartTableColumn[];
  rows: ReadonlyArray<Record<string, ReactNode>>;
  /** Highlight rows (e.g. bins beyond a limit); the reason is also in a cell, never only in the colour. */
  rowTone?: (index: number) => 'out' | undefined;
}

/** The data behind a chart, as a plain table (scrolls inside its box when long). */
export function ChartTable({ caption, columns, rows, rowTone }: ChartTableProps) {
  return (
    <div role="region" aria-label={caption} tabIndex={0} className="max-h-96 overflow-auto rounded-md border border-ink-200">
      <table className="w-full border-collapse text-left text-[0.8125rem]">
        <caption className="sr-only">{caption}</caption>
        <thead className="sticky top-0 bg-ink-50">
          <tr>
            {columns.map((c) => (
              <th key={c.key} scope="col" className={cx('border-b border-ink-200 px-3 py-1.5 font-semibold whitespace-nowrap text-ink-800', c.numeric && 'text-right')}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i} className={cx('border-b border-ink-100 last:border-0', rowTone?.(i) === 'out' && 'bg-[#fbe7d9]')}>
              {columns.map((c, j) => {
                const Cell = j === 0 ? 'th' : 'td';
                return (
                  <Cell key={c.key} scope={j === 0 ? 'row' : undefined} className={cx('px-3 py-1 align-top font-normal text-ink-800', c.numeric && 'num text-right whitespace-nowrap')}>
                    {r[c.key]}
                  </Cell>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
