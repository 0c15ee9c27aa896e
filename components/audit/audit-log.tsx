'use client';

import { useAudit, type AuditEntry } from '@/components/hooks/use-audit';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Button } from '@/components/ui/button';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { formatDate, formatDateTime, formatRelative, formatTime } from '@/components/ui/format';
import { describeAction, describeTarget } from './describe';

const columns: Column<AuditEntry>[] = [
  {
    key: 'when',
    header: 'When',
    sortValue: (e) => e.id,
    cell: (e) => (
      <time dateTime={e.at} title={`${formatDateTime(e.at)} (${formatRelative(e.at)})`} className="num text-[0.8125rem] text-ink-700">
        <span className="block whitespace-nowrap sm:inline">{formatDate(e.at)}</span>
        <span className="hidden sm:inline">, </span>
        <span className="block whitespace-nowrap sm:inline">{formatTime(e.at)}</span>
      </time>
    ),
  },
  {
    key: 'who',
    header: 'Who',
    sortValue: (e) => e.actorName ?? '',
    cell: (e) =>
      e.actorName || e.actorEmail ? (
        <span className="block min-w-0">
          <span className="block font-medium text-ink-900">{e.actorName ?? e.actorEmail}</span>
          {e.actorName && e.actorEmail ? <span className="hidden text-xs break-all text-ink-600 sm:block">{e.actorEmail}</span> : null}
        </span>
      ) : (
        <span className="text-ink-600">Stochos (system)</span>
      ),
  },
  { key: 'action', header: 'Action', cell: (e) => describeAction(e) },
  { key: 'target', header: 'Target', cell: (e) => <span className="break-all text-ink-700">{describeTarget(e)}</span>, hideBelow: 'sm' },
];

export function AuditLog() {
  const audit = useAudit();
  if (audit.error && !audit.data) return <LoadError error={audit.error} what="the audit log" onRetry={() => audit.mutate()} />;
  if (!audit.data) return <Loading>Loading the audit log…</Loading>;
  return (
    <div className="space-y-4">
      <DataTable
        caption="Audit log, newest first"
        columns={columns}
        rows={audit.entries}
        rowKey={(e) => String(e.id)}
        empty={
          <EmptyState title="Nothing recorded yet">
            <p>Sign-ins, invitations, role changes, removals and settings changes are recorded here as they happen, with who did them and when.</p>
          </EmptyState>
        }
      />
      {audit.error ? <LoadError error={audit.error} what="older entries" onRetry={() => audit.mutate()} /> : null}
      {audit.entries.length ? (
        <div className="flex flex-wrap items-center gap-3">
          {audit.hasOlder ? (
            <Button variant="secondary" pending={audit.loadingOlder} pendingLabel="Loading older entries…" onClick={() => audit.loadOlder()}>
              Load older
            </Button>
          ) : null}
          <p className="text-sm text-ink-600">
            Showing <span className="num text-ink-900">{audit.entries.length}</span> {audit.entries.length === 1 ? 'entry' : 'entries'}
            {audit.hasOlder ? '.' : ', back to the first one.'}
          </p>
        </div>
      ) : null}
    </div>
  );
}
