'use client';

import Link from 'next/link';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { DateText } from '@/components/ui/date-text';
import { useWaitingChecks, type WaitingVersion } from '@/components/hooks/use-notification-prefs';

const COLUMNS: readonly Column<WaitingVersion>[] = [
  {
    key: 'model',
    header: 'Model and version',
    cell: (v) => (
      <Link href={`/app/models/${v.modelId}/versions/${v.number}/check`} className="font-medium text-accent-800 underline-offset-2 hover:underline">
        {v.modelTitle}, version {v.number}
      </Link>
    ),
    sortValue: (v) => v.modelTitle,
  },
  { key: 'author', header: 'Author', cell: (v) => v.authorName ?? 'a former member', sortValue: (v) => v.authorName ?? '' },
  { key: 'note', header: 'Author’s note', cell: (v) => v.note ?? <span className="text-ink-600">no note</span>, hideBelow: 'md', className: 'max-w-md break-words' },
  { key: 'saved', header: 'Saved', cell: (v) => <DateText iso={v.createdAt} />, sortValue: (v) => v.createdAt },
];

export function WaitingChecks() {
  const { data, error, mutate } = useWaitingChecks(true);
  if (error) return <LoadError error={error} what="the versions to check" onRetry={() => mutate()} />;
  if (!data) return <Loading>Loading the versions to check…</Loading>;
  return (
    <DataTable
      caption="Versions waiting for your check"
      columns={COLUMNS}
      rows={data.versions}
      rowKey={(v) => `${v.modelId}:${v.number}`}
      initialSort={{ key: 'saved', dir: 'asc' }}
      empty={<EmptyState title="Nothing waits for your check">When an author saves a version, it appears here and you receive an e-mail (unless you turned it off in Settings).</EmptyState>}
    />
  );
}
