'use client';

import { useState } from 'react';
import type { SnapshotListRow } from '@/lib/core/api-types';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Select } from '@/components/ui/field';
import { StatusPill } from '@/components/ui/badge';
import { DateText } from '@/components/ui/date-text';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { useClients } from '@/components/clients/use-clients';
import { useSnapshots } from './use-snapshots';
import { snapshotErrorText, snapshotStatus } from './snapshot-state';

const columns: Column<SnapshotListRow>[] = [
  { key: 'requested', header: 'Requested', sortValue: (s) => Date.parse(s.createdAt), cell: (s) => <DateText iso={s.createdAt} mode="absolute" /> },
  { key: 'client', header: 'Client', sortValue: (s) => s.clientName, cell: (s) => s.clientName, hideBelow: 'md' },
  { key: 'widget', header: 'Widget', sortValue: (s) => s.widgetTitle, cell: (s) => s.widgetTitle },
  { key: 'recipient', header: 'Recipient', sortValue: (s) => s.recipient, cell: (s) => <span className="break-all">{s.recipient}</span> },
  {
    key: 'state',
    header: 'State',
    sortValue: (s) => s.state,
    cell: (s) => {
      const st = snapshotStatus(s.state, s.attempts);
      return <StatusPill kind={st.kind}>{st.text}</StatusPill>;
    },
  },
  { key: 'attempts', header: 'Attempts', numeric: true, sortValue: (s) => s.attempts, cell: (s) => s.attempts, hideBelow: 'sm' },
  { key: 'sent', header: 'Sent', sortValue: (s) => (s.sentAt ? Date.parse(s.sentAt) : null), cell: (s) => <DateText iso={s.sentAt} mode="absolute" empty="Not yet" />, hideBelow: 'sm' },
  {
    key: 'error',
    header: 'Last problem',
    cell: (s) => {
      const text = snapshotErrorText(s.lastError, s.state);
      return text ? <span className="text-[0.8125rem] text-ink-700">{text}</span> : <span className="text-ink-500">None</span>;
    },
    hideBelow: 'lg',
  },
];

export function SnapshotsList({ initialClientId }: { initialClientId: string | null }) {
  const [clientId, setClientId] = useState<string | null>(initialClientId);
  const clients = useClients(true);
  const snapshots = useSnapshots(clientId);
  const clientName = clients.data?.clients.find((c) => c.id === clientId)?.name;

  return (
    <div className="space-y-6">
      <Select
        label="Client"
        controlWidth="w-72"
        value={clientId ?? ''}
        onChange={(e) => setClientId(e.target.value || null)}
        options={[{ value: '', label: 'All clients' }, ...(clients.data?.clients ?? []).map((c) => ({ value: c.id, label: c.archivedAt ? `${c.name} (archived)` : c.name }))]}
      />
      {snapshots.error ? (
        <LoadError error={snapshots.error} what="the snapshot requests" onRetry={() => snapshots.mutate()} />
      ) : !snapshots.data ? (
        <Loading>Loading snapshot requests…</Loading>
      ) : (
        <DataTable
          caption={clientName ? `Snapshot requests from ${clientName}` : 'Snapshot requests'}
          columns={columns}
          rows={snapshots.data.snapshots}
          rowKey={(s) => s.id}
          initialSort={{ key: 'requested', dir: 'desc' }}
          empty={
            <EmptyState title={clientName ? `No snapshot requests from ${clientName} yet` : 'No snapshot requests yet'}>
              <p>
                A row appears here each time a client viewer presses “E-mail this view” in an embedded widget and asks for a PDF of what they see. The PDF goes only to
                addresses in the client’s allowed e-mail domains.
              </p>
              <p>To make this possible, give the client at least one allowed e-mail domain and grant it a widget on the Clients page.</p>
            </EmptyState>
          }
        />
      )}
    </div>
  );
}
