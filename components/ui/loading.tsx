import { cx } from './cx';

/** A quiet loading line for regions that fetch data; announced politely. */
export function Loading({ children = 'Loading…', className }: { children?: React.ReactNode; className?: string }) {
  return (
    <p role="status" className={cx('flex items-center gap-2 py-6 text-sm text-ink-600', className)}>
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4 animate-spin text-accent-700 motion-reduce:animate-none">
        <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeOpacity="0.25" strokeWidth="2" />
        <path d="M14 8a6 6 0 0 0-6-6" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
      </svg>
      {children}
    </p>
  );
}
