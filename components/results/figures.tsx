import type { ReactNode } from 'react';
import { cx } from '@/components/ui/cx';

export type FigureTone = 'neutral' | 'good' | 'warn' | 'bad';

const toneText: Record<FigureTone, string> = {
  neutral: 'text-ink-600',
  good: 'text-accent-800',
  warn: 'text-warn-700',
  bad: 'text-danger-700',
};

/** A status mark that reads without colour: an icon shape plus words. */
export function StatusMark({ tone, children }: { tone: FigureTone; children: ReactNode }) {
  return (
    <span className={cx('inline-flex items-center gap-1 font-medium', toneText[tone])}>
      <svg aria-hidden="true" viewBox="0 0 12 12" className="h-3 w-3 flex-none">
        {tone === 'good' ? (
          <path d="m2 6.3 2.6 2.5L10 3.3" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
        ) : tone === 'bad' ? (
          <path d="m2.5 2.5 7 7m0-7-7 7" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        ) : tone === 'warn' ? (
          <path d="M6 1.2 11 10.5H1Z" fill="currentColor" />
        ) : (
          <circle cx="6" cy="6" r="2.5" fill="currentColor" />
        )}
      </svg>
      {children}
    </span>
  );
}

export interface FigureProps {
  label: ReactNode;
  /** The number with its unit, already formatted. */
  value: ReactNode;
  /** A second line: interval, comparison, status. */
  sub?: ReactNode;
  /** Highlight the one figure a reader asks for. */
  lead?: boolean;
  className?: string;
}

/** One headline figure: label, the number in tabular mono figures, a short note. */
export function Figure({ label, value, sub, lead, className }: FigureProps) {
  return (
    <div className={cx('min-w-0 rounded-md border px-3 py-2.5', lead ? 'border-accent-200 bg-accent-50' : 'border-ink-200 bg-white', className)}>
      <dt className="text-[0.8125rem] leading-snug text-ink-700">{label}</dt>
      <dd className={cx('num mt-0.5 font-semibold break-words text-ink-900', lead ? 'text-2xl' : 'text-xl')}>{value}</dd>
      {sub ? <dd className="mt-0.5 text-xs leading-snug text-ink-600">{sub}</dd> : null}
    </div>
  );
}

/** A row of headline figures (a description list, two columns on phones). */
export function Figures({ label, children, className }: { label: string; children: ReactNode; className?: string }) {
  return (
    // Columns follow the width of the results column, not the window: the studio shows results beside the editor.
    <div className="@container">
      <dl aria-label={label} className={cx('grid grid-cols-1 gap-2 @xs:grid-cols-2 @3xl:grid-cols-4', className)}>
        {children}
      </dl>
    </div>
  );
}
