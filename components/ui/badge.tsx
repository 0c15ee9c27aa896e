import type { ReactNode } from 'react';
import { cx } from './cx';

export type BadgeTone = 'neutral' | 'accent' | 'warn' | 'danger';

const tones: Record<BadgeTone, string> = {
  neutral: 'bg-ink-100 text-ink-700 ring-ink-200',
  accent: 'bg-accent-50 text-accent-800 ring-accent-200',
  warn: 'bg-warn-50 text-warn-700 ring-warn-600/30',
  danger: 'bg-danger-50 text-danger-700 ring-danger-600/30',
};

/** A small label, e.g. a role. Meaning is in the text; colour only groups. */
export function Badge({ tone = 'neutral', className, children }: { tone?: BadgeTone; className?: string; children: ReactNode }) {
  return <span className={cx('inline-flex items-center rounded px-1.5 py-0.5 text-xs font-medium ring-1 ring-inset', tones[tone], className)}>{children}</span>;
}

/**
 * A status: each kind has its own shape as well as its colour, so it reads without colour vision.
 * ok = filled disc, waiting = hollow ring, warn = triangle, stopped = square, info = diamond.
 */
export type StatusKind = 'ok' | 'waiting' | 'warn' | 'stopped' | 'info';

const statusTone: Record<StatusKind, string> = {
  ok: 'bg-accent-50 text-accent-800 ring-accent-200',
  waiting: 'bg-white text-ink-700 ring-ink-300',
  warn: 'bg-warn-50 text-warn-700 ring-warn-600/30',
  stopped: 'bg-ink-100 text-ink-700 ring-ink-300',
  info: 'bg-white text-accent-800 ring-accent-200',
};

function Shape({ kind }: { kind: StatusKind }) {
  const common = { 'aria-hidden': true, viewBox: '0 0 10 10', className: 'h-2.5 w-2.5 flex-none' } as const;
  switch (kind) {
    case 'ok':
      return (
        <svg {...common}>
          <circle cx="5" cy="5" r="4" fill="currentColor" />
        </svg>
      );
    case 'waiting':
      return (
        <svg {...common}>
          <circle cx="5" cy="5" r="3.4" fill="none" stroke="currentColor" strokeWidth="1.5" />
        </svg>
      );
    case 'warn':
      return (
        <svg {...common}>
          <path d="M5 .8 9.6 9H.4Z" fill="currentColor" />
        </svg>
      );
    case 'stopped':
      return (
        <svg {...common}>
          <rect x="1.2" y="1.2" width="7.6" height="7.6" fill="currentColor" />
        </svg>
      );
    case 'info':
      return (
        <svg {...common}>
          <path d="M5 .5 9.5 5 5 9.5.5 5Z" fill="currentColor" />
        </svg>
      );
  }
}

export function StatusPill({ kind, className, children }: { kind: StatusKind; className?: string; children: ReactNode }) {
  return (
    <span className={cx('inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ring-1 ring-inset', statusTone[kind], className)}>
      <Shape kind={kind} />
      {children}
    </span>
  );
}
