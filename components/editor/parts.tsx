'use client';

import type { ReactNode } from 'react';
import { cx } from '@/components/ui/cx';
import { useEditor } from './editor-context';

// Small building blocks shared by the template forms: sections, row buttons, table wrappers.

export function Section({ id: name, title, description, actions, children }: { id: string; title: ReactNode; description?: ReactNode; actions?: ReactNode; children: ReactNode }) {
  // Prefixed per editor, so two editors on one page (a version beside the previous one) keep unique ids.
  const id = useEditor().idFor(`section.${name}`);
  return (
    <section id={id} aria-labelledby={`${id}-title`} className="rounded-lg border border-ink-200 bg-white shadow-[0_1px_0_rgb(20_28_34/0.04)]">
      <header className="flex flex-wrap items-start justify-between gap-3 border-b border-ink-100 px-4 py-3 sm:px-5">
        <div className="min-w-0">
          <h2 id={`${id}-title`} className="text-[0.9375rem] font-semibold text-ink-900">
            {title}
          </h2>
          {description ? <p className="mt-0.5 max-w-3xl text-sm text-ink-600">{description}</p> : null}
        </div>
        {actions ? <div className="flex flex-wrap items-center gap-2">{actions}</div> : null}
      </header>
      <div className="px-4 py-4 sm:px-5">{children}</div>
    </section>
  );
}

function IconButton({ label, onClick, disabled, children, tone = 'neutral' }: { label: string; onClick: () => void; disabled?: boolean; children: ReactNode; tone?: 'neutral' | 'danger' }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      onClick={onClick}
      disabled={disabled}
      className={cx(
        'inline-flex h-8 w-8 items-center justify-center rounded-md text-ink-600 disabled:cursor-not-allowed disabled:opacity-35',
        tone === 'danger' ? 'hover:bg-danger-50 hover:text-danger-700' : 'hover:bg-ink-100 hover:text-ink-900',
      )}
    >
      {children}
    </button>
  );
}

/** Move up / move down / remove for one row; hidden when the editor is read-only. */
export function RowButtons({ index, count, what, onMove, onRemove, minRows = 0 }: { index: number; count: number; what: string; onMove?: (from: number, to: number) => void; onRemove: () => void; minRows?: number }) {
  const { readOnly } = useEditor();
  if (readOnly) return null;
  return (
    <div className="flex items-center justify-end gap-0.5">
      {onMove ? (
        <>
          <IconButton label={`Move ${what} up`} disabled={index === 0} onClick={() => onMove(index, index - 1)}>
            <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4">
              <path d="M8 13V3M4 7l4-4 4 4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
            </svg>
          </IconButton>
          <IconButton label={`Move ${what} down`} disabled={index === count - 1} onClick={() => onMove(index, index + 1)}>
            <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4">
              <path d="M8 3v10M4 9l4 4 4-4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
            </svg>
          </IconButton>
        </>
      ) : null}
      <IconButton label={`Remove ${what}`} tone="danger" disabled={count <= minRows} onClick={onRemove}>
        <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4">
          <path d="M3 4.5h10M6.5 4.5V3h3v1.5M4.5 4.5l.6 8.5h5.8l.6-8.5" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      </IconButton>
    </div>
  );
}

export function AddButton({ onClick, children }: { onClick: () => void; children: ReactNode }) {
  const { readOnly } = useEditor();
  if (readOnly) return null;
  return (
    <button
      type="button"
      onClick={onClick}
      className="inline-flex h-8 items-center gap-1.5 rounded-md border border-dashed border-ink-300 bg-white px-3 text-sm font-medium text-ink-800 hover:border-accent-600 hover:text-accent-800"
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5">
        <path d="M8 3v10M3 8h10" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </svg>
      {children}
    </button>
  );
}

/** A table that scrolls sideways inside its own box on narrow screens; the caption names it for screen readers. */
export function ScrollTable({ caption, minWidth, children }: { caption: string; minWidth: number; children: ReactNode }) {
  return (
    <div className="relative -mx-4 overflow-x-auto px-4 sm:-mx-5 sm:px-5" role="region" aria-label={`${caption} table`} tabIndex={0}>
      <table className="w-full border-separate border-spacing-0 text-sm" style={{ minWidth }}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ children, className, scope = 'col' }: { children?: ReactNode; className?: string; scope?: 'col' | 'row' }) {
  return (
    <th scope={scope} className={cx('border-b border-ink-200 px-1.5 py-2 text-left align-bottom text-xs font-semibold tracking-wide text-ink-600', className)}>
      {children}
    </th>
  );
}

export function Td({ children, className, colSpan }: { children?: ReactNode; className?: string; colSpan?: number }) {
  return (
    <td colSpan={colSpan} className={cx('border-b border-ink-100 px-1.5 py-1.5 align-top', className)}>
      {children}
    </td>
  );
}

/** An empty list says what to do next. */
export function EmptyRows({ children }: { children: ReactNode }) {
  return <p className="rounded-md border border-dashed border-ink-300 bg-ink-50 px-4 py-5 text-center text-sm text-ink-700">{children}</p>;
}
