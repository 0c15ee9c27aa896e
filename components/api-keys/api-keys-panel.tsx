'use client';

import { useState } from 'react';
import { useApiKeys, type ApiKey } from './use-api-keys';
import { ApiError, errorMessage } from '@/lib/client/api';
import { Card } from '@/components/ui/card';
import { TextField } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Banner } from '@/components/ui/banner';
import { CopyButton } from '@/components/ui/copy-button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { DataTable, type Column } from '@/components/ui/data-table';
import { DateText } from '@/components/ui/date-text';
import { StatusPill } from '@/components/ui/badge';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';

/** Owner's panel: create and revoke keys for POST /api/v1/simulate. A new key's secret is shown once. */
export function ApiKeysPanel() {
  const { data, error, isLoading, mutate, create, revoke } = useApiKeys();
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string | undefined>();
  const [formError, setFormError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const [fresh, setFresh] = useState<{ name: string; secret: string } | null>(null);

  async function onCreate(e: React.FormEvent) {
    e.preventDefault();
    setPending(true);
    setNameError(undefined);
    setFormError(null);
    try {
      const key = await create(name);
      setFresh({ name: key.name, secret: key.secret });
      setName('');
    } catch (err) {
      if (err instanceof ApiError && err.fields?.name) setNameError(err.fields.name.join(' '));
      else setFormError(errorMessage(err));
    } finally {
      setPending(false);
    }
  }

  const columns: Column<ApiKey>[] = [
    { key: 'name', header: 'Name', cell: (k) => k.name, sortValue: (k) => k.name },
    { key: 'prefix', header: 'Key begins', cell: (k) => <span className="num">{k.prefix}…</span> },
    { key: 'created', header: 'Created', cell: (k) => <DateText iso={k.createdAt} />, sortValue: (k) => k.createdAt, hideBelow: 'md' },
    { key: 'used', header: 'Last used', cell: (k) => <DateText iso={k.lastUsedAt} empty="Never" />, sortValue: (k) => k.lastUsedAt ?? '' },
    {
      key: 'status',
      header: 'Status',
      cell: (k) => (k.revokedAt ? <StatusPill kind="stopped">Revoked</StatusPill> : <StatusPill kind="ok">Active</StatusPill>),
    },
    {
      key: 'actions',
      header: <span className="sr-only">Actions</span>,
      cell: (k) =>
        k.revokedAt ? null : (
          <ConfirmButton ariaLabel={`Revoke ${k.name}`} prompt="Programs using this key stop working at once." confirmLabel="Yes, revoke" variant="secondary" size="sm" onConfirm={() => revoke(k.id)}>
            Revoke
          </ConfirmButton>
        ),
    },
  ];

  return (
    <Card
      title="API keys"
      description="Programs can run models on the server with POST /api/v1/simulate and a key sent as Authorization: Bearer <key>. The model format is described on the model JSON page."
    >
      {fresh && (
        <Banner tone="success" title={`Key “${fresh.name}” created`} className="mb-4">
          <p>Copy it now: it is shown only once.</p>
          <div className="mt-2 flex flex-wrap items-center gap-2">
            <code className="num break-all rounded bg-white px-2 py-1 text-ink-900">{fresh.secret}</code>
            <CopyButton value={fresh.secret} what="API key" />
          </div>
        </Banner>
      )}
      <form onSubmit={onCreate} className="mb-5 flex flex-wrap items-end gap-3" noValidate>
        <TextField label="Name of the new key" hint="What will use it, e.g. “Nightly model check”." value={name} onChange={(e) => setName(e.target.value)} error={nameError} className="min-w-0 flex-1 basis-64" />
        <Button type="submit" pending={pending} pendingLabel="Creating…">
          Create API key
        </Button>
      </form>
      {formError && (
        <Banner tone="danger" className="mb-4">
          {formError}
        </Banner>
      )}
      {isLoading ? (
        <Loading>Loading keys…</Loading>
      ) : error ? (
        <LoadError error={error} what="API keys" onRetry={() => mutate()} />
      ) : (
        <DataTable
          caption="API keys"
          columns={columns}
          rows={data?.keys ?? []}
          rowKey={(k) => k.id}
          initialSort={{ key: 'created', dir: 'desc' }}
          empty={<p className="text-sm text-ink-600">No API keys yet. Create one above when a program needs to run models.</p>}
        />
      )}
    </Card>
  );
}
