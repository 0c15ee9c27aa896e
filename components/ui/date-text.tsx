import { formatDateTime, formatRelative } from './format';

/** A <time> element: relative words ("3 hours ago") with the exact date and time as its title, or the date itself. */
export function DateText({ iso, mode = 'relative', empty = '—' }: { iso: string | null | undefined; mode?: 'relative' | 'absolute'; empty?: string }) {
  if (!iso) return <span className="text-ink-500">{empty}</span>;
  const exact = formatDateTime(iso);
  return (
    <time dateTime={iso} title={exact}>
      {mode === 'relative' ? formatRelative(iso) : exact}
    </time>
  );
}
