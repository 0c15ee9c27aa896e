'use client';

import Link from 'next/link';
import { DataTable, DateText, EmptyState, StatusPill, type Column } from '@/components/ui';
import type { VersionSummary } from '@/lib/core/models/types';
import { CheckStatePill } from './check-state-pill';

export interface VersionHistoryProps {
  modelId: string;
  versions: readonly VersionSummary[];
  /** The version the live widget shows, if any. */
  publishedNumber: number | null;
  userId: string;
  canCheck: boolean;
}

/** Every saved version, newest first, with who wrote it, who checked it and what they said. */
export function VersionHistory({ modelId, versions, publishedNumber, userId, canCheck }: VersionHistoryProps) {
  const columns: Column<VersionSummary>[] = [
    {
      key: 'number',
      header: 'Version',
      numeric: true,
      sortValue: (v) => v.number,
      cell: (v) => (
        <Link href={`/app/models/${modelId}/versions/${v.number}`} className="font-medium text-accent-800 hover:underline">
          v{v.number}
        </Link>
      ),
    },
    {
      key: 'author',
      header: 'Saved by',
      sortValue: (v) => v.createdAt,
      cell: (v) => (
        <span>
          {v.authorName ?? 'Former member'}
          <span className="block text-xs text-ink-600">
            <DateText iso={v.createdAt} mode="absolute" />
          </span>
        </span>
      ),
    },
    { key: 'note', header: 'Note', cell: (v) => (v.note ? <span className="line-clamp-2 max-w-xs">{v.note}</span> : <span className="text-ink-500">—</span>), hideBelow: 'md' },
    {
      key: 'check',
      header: 'Check',
      sortValue: (v) => v.checkState,
      cell: (v) => (
        <span className="space-y-1">
          <span className="flex flex-wrap gap-1.5">
            <CheckStatePill state={v.checkState} />
            {publishedNumber === v.number ? <StatusPill kind="info">Published</StatusPill> : null}
          </span>
          {v.checkState !== 'unchecked' ? (
            <span className="block text-xs text-ink-600">
              {v.checkerName ?? 'Former member'}, <DateText iso={v.checkedAt} />
              {v.checkNote ? <span className="block max-w-xs truncate italic">“{v.checkNote}”</span> : null}
              {v.comments.length ? <span className="block">{v.comments.length === 1 ? '1 field comment' : `${v.comments.length} field comments`}</span> : null}
            </span>
          ) : null}
        </span>
      ),
    },
    {
      key: 'actions',
      header: <span className="sr-only">Actions</span>,
      cell: (v) => (
        <span className="flex flex-wrap justify-end gap-2 text-sm">
          {v.number > 1 || canCheck ? (
            <Link href={`/app/models/${modelId}/versions/${v.number}/check`} className="font-medium text-accent-800 hover:underline">
              {canCheck && v.checkState === 'unchecked' && v.authorId !== userId ? `Check v${v.number}` : v.number > 1 ? `Compare with v${v.number - 1}` : 'Review'}
            </Link>
          ) : null}
        </span>
      ),
    },
  ];
  return (
    <DataTable
      caption="Version history"
      columns={columns}
      rows={versions}
      rowKey={(v) => v.id}
      initialSort={{ key: 'number', dir: 'desc' }}
      empty={
        <EmptyState title="No version saved yet" as="h3">
          <p>Edit the model, then choose “Save version”. Each version is kept unchanged; a checker signs it off before it can be published.</p>
        </EmptyState>
      }
    />
  );
}
