'use client';

import Link from 'next/link';
import { useState } from 'react';
import { Card } from '@/components/ui/card';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Banner } from '@/components/ui/banner';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/field';
import { StatusPill } from '@/components/ui/badge';
import { DateText } from '@/components/ui/date-text';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import type { ClientListView } from '@/lib/core/embed/views';
import { ClientForm } from './client-form';
import { useClients } from './use-clients';

export function ClientsList({ canManage }: { canManage: boolean }) {
  const [showArchived, setShowArchived] = useState(false);
  const [adding, setAdding] = useState(false);
  const [created, setCreated] = useState<{ id: string; name: string } | null>(null);
  const clients = useClients(showArchived);

  const columns: Column<ClientListView>[] = [
    {
      key: 'name',
      header: 'Client',
      sortValue: (c) => c.name,
      cell: (c) => (
        <Link href={`/app/clients/${c.id}`} className="font-medium text-accent-800 underline decoration-accent-300 hover:decoration-accent-700">
          {c.name}
        </Link>
      ),
    },
    {
      key: 'origins',
      header: 'Allowed origins',
      cell: (c) => (
        <ul className="num space-y-0.5 text-[0.8125rem] text-ink-700">
          {c.allowedOrigins.map((o) => (
            <li key={o} className="break-all">
              {o}
            </li>
          ))}
        </ul>
      ),
      hideBelow: 'md',
    },
    {
      key: 'domains',
      header: 'E-mail domains',
      cell: (c) =>
        c.snapshotAnyAddress ? (
          <span className="text-[0.8125rem] font-medium text-warn-700">Any address (not recommended)</span>
        ) : c.allowedEmailDomains.length ? (
          <span className="text-[0.8125rem] text-ink-700">{c.allowedEmailDomains.join(', ')}</span>
        ) : (
          <span className="text-ink-500">None</span>
        ),
      hideBelow: 'lg',
    },
    { key: 'passes', header: 'Live passes', numeric: true, sortValue: (c) => c.activePasses, cell: (c) => `${c.activePasses} of ${c.totalPasses}` },
    { key: 'lastView', header: 'Last view', sortValue: (c) => (c.lastViewAt ? Date.parse(c.lastViewAt) : null), cell: (c) => <DateText iso={c.lastViewAt} empty="Never" />, hideBelow: 'sm' },
    {
      key: 'status',
      header: 'Status',
      sortValue: (c) => (c.archivedAt ? 1 : 0),
      cell: (c) => (c.archivedAt ? <StatusPill kind="stopped">Archived</StatusPill> : <StatusPill kind="ok">Active</StatusPill>),
    },
  ];

  return (
    <div className="space-y-6">
      {created ? (
        <Banner tone="success" title={`${created.name} added`} action={<Link href={`/app/clients/${created.id}`} className="font-medium text-accent-800 underline">Grant a widget</Link>}>
          Next, open the client and grant it a published widget: you get the snippet its web team pastes into their portal.
        </Banner>
      ) : null}
      {canManage ? (
        adding ? (
          <Card title="New client" description="A client organisation of your firm. Only the origins listed here can show its widgets.">
            <ClientForm
              submitLabel="Add client"
              onCancel={() => setAdding(false)}
              onSubmit={async (body) => {
                const c = await clients.create(body);
                setCreated({ id: c.id, name: c.name });
                setAdding(false);
              }}
            />
          </Card>
        ) : (
          <div>
            <Button onClick={() => (setAdding(true), setCreated(null))}>New client</Button>
          </div>
        )
      ) : null}

      <div className="flex items-center justify-end">
        <Checkbox label="Show archived clients" checked={showArchived} onChange={(e) => setShowArchived(e.target.checked)} />
      </div>

      {clients.error ? (
        <LoadError error={clients.error} what="the clients" onRetry={() => clients.mutate()} />
      ) : !clients.data ? (
        <Loading>Loading clients…</Loading>
      ) : (
        <DataTable
          caption="Clients"
          columns={columns}
          rows={clients.data.clients}
          rowKey={(c) => c.id}
          initialSort={{ key: 'name', dir: 'asc' }}
          empty={
            <EmptyState title={showArchived ? 'No clients, archived or not' : 'No clients yet'}>
              <p>
                Each client has its own allowed origins (the exact addresses of its portal pages that may show a widget) and allowed e-mail domains (whose people may ask for a PDF
                snapshot). Granting a widget to a client creates a pass you can revoke at any time.
              </p>
              <p>{canManage ? 'Start with New client above.' : 'Authors and the account owner add clients; they will be listed here.'}</p>
            </EmptyState>
          }
        />
      )}
    </div>
  );
}
