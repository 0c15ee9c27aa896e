'use client';

import Link from 'next/link';
import { useWaitingChecks } from '@/components/hooks/use-notification-prefs';

/** The checker's count of versions waiting for them, in the header; links to the list. Hidden at zero. */
export function ReviewCount() {
  const { data } = useWaitingChecks(true);
  const n = data?.count ?? 0;
  if (!n) return null;
  const label = `${n} ${n === 1 ? 'version waits' : 'versions wait'} for your check`;
  return (
    <Link
      href="/app/reviews"
      aria-label={label}
      title={label}
      data-testid="review-count"
      className="inline-flex h-8 flex-none items-center gap-1.5 rounded-full bg-accent-300 px-2.5 text-sm font-semibold text-ink-900 hover:bg-accent-200"
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round">
        <path d="M3 8.5 6.5 12 13 4.5" />
      </svg>
      <span className="num">{n}</span>
      <span>to check</span>
    </Link>
  );
}
