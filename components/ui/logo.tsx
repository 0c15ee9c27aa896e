import { cx } from './cx';

/** The Stochos mark: a small histogram whose tail bars sit beyond a limit, drawn in ink and teal. */
export function LogoMark({ className }: { className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 32 32" className={cx('h-7 w-7 flex-none', className)}>
      <rect width="32" height="32" rx="7" fill="#141c22" />
      <rect x="5" y="20" width="3.4" height="5" rx="0.8" fill="#3ba597" />
      <rect x="9.4" y="14" width="3.4" height="11" rx="0.8" fill="#3ba597" />
      <rect x="13.8" y="8" width="3.4" height="17" rx="0.8" fill="#3ba597" />
      <rect x="18.2" y="12" width="3.4" height="13" rx="0.8" fill="#a6ddd5" />
      <rect x="22.6" y="18" width="3.4" height="7" rx="0.8" fill="none" stroke="#a6ddd5" strokeWidth="1" />
      <path d="M4 27h24" stroke="#7b8b97" strokeWidth="1" strokeLinecap="round" />
    </svg>
  );
}

/** Mark plus word. `tone="light"` for dark surfaces. */
export function Logo({ tone = 'dark', className }: { tone?: 'dark' | 'light'; className?: string }) {
  return (
    <span className={cx('inline-flex items-center gap-2', className)}>
      <LogoMark />
      <span className={cx('text-[1.0625rem] font-semibold tracking-tight', tone === 'dark' ? 'text-ink-900' : 'text-white')}>Stochos</span>
    </span>
  );
}
