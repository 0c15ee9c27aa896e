import type { Caution } from '@/lib/core/cautions';
import { cx } from '@/components/ui/cx';

/** The cautions beside a result (DESIGN.md §12); the low-trial flag, when present, comes first. */
export function CautionsList({ cautions, className, compact }: { cautions: readonly Caution[]; className?: string; compact?: boolean }) {
  if (!cautions.length) return null;
  return (
    <div role="note" aria-label="Cautions" className={cx('rounded-md border border-ink-200 bg-ink-50 px-3 py-2.5 text-[0.8125rem] leading-snug text-ink-700', className)}>
      <h3 className="mb-1 flex items-center gap-1.5 text-[0.8125rem] font-semibold text-ink-900">
        <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5 flex-none text-ink-600">
          <circle cx="8" cy="8" r="6.5" fill="none" stroke="currentColor" strokeWidth="1.5" />
          <path d="M8 7v4.2M8 4.6v.2" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
        </svg>
        Read with care
      </h3>
      <ul className={cx('space-y-1', compact && 'space-y-0.5')}>
        {cautions.map((c) => (
          <li key={c.id} className={c.id === 'low-trials' ? 'font-medium text-warn-700' : undefined}>
            {compact ? null : <span className="font-medium text-ink-800">{c.title}: </span>}
            {c.text}
          </li>
        ))}
      </ul>
    </div>
  );
}
