import type { ReactNode } from 'react';
import { cx } from './cx';

export interface EmptyStateProps {
  title: ReactNode;
  /** What will appear here, and who makes it appear. */
  children?: ReactNode;
  /** The next step: a button or link. */
  action?: ReactNode;
  /** A small drawing; a neutral outline chart is used when omitted. */
  icon?: ReactNode;
  /** Heading level (h2 on a page, h3 inside a card). */
  as?: 'h2' | 'h3';
  /** A smaller version without the drawing, for a list inside a busy page. */
  compact?: boolean;
  className?: string;
}

function DefaultIcon() {
  return (
    <svg aria-hidden="true" viewBox="0 0 48 40" className="h-10 w-12 text-ink-400">
      <path d="M2 36h44" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
      {[
        [6, 30],
        [13, 22],
        [20, 12],
        [27, 16],
        [34, 25],
      ].map(([x, y]) => (
        <rect key={x} x={x} y={y} width="5" height={34 - y} rx="1" fill="none" stroke="currentColor" strokeWidth="1.5" strokeDasharray="2.5 2" />
      ))}
      <path d="M42 6v30" stroke="#1f887b" strokeWidth="1.5" strokeDasharray="3 2" />
    </svg>
  );
}

export function EmptyState({ title, children, action, icon, as: H = 'h2', compact = false, className }: EmptyStateProps) {
  return (
    <div
      className={cx(
        'flex flex-col items-center rounded-lg border border-dashed border-ink-300 bg-white px-5 text-center',
        compact ? 'py-5' : 'st-grid py-10 sm:py-12',
        className,
      )}
    >
      {compact && !icon ? null : <div className="mb-3">{icon ?? <DefaultIcon />}</div>}
      <H className="text-base font-semibold text-ink-900">{title}</H>
      {children ? <div className="mt-1.5 max-w-prose space-y-2 text-sm text-ink-600">{children}</div> : null}
      {action ? <div className="mt-4 flex flex-wrap justify-center gap-2">{action}</div> : null}
    </div>
  );
}
