'use client';

import Link from 'next/link';
import { useState } from 'react';
import { errorMessage } from '@/lib/client/api';
import { PASS_DEFAULT_DAYS, PASS_MAX_DAYS } from '@/lib/core/embed/schemas';
import type { PassView } from '@/lib/core/embed/views';
import { Card } from '@/components/ui/card';
import { Banner } from '@/components/ui/banner';
import { Button } from '@/components/ui/button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { NumberField, Select } from '@/components/ui/field';
import { StatusPill } from '@/components/ui/badge';
import { DateText } from '@/components/ui/date-text';
import { EmptyState } from '@/components/ui/empty-state';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { PageHeader } from '@/components/ui/page-header';
import { ClientForm } from './client-form';
import { PassCounts, PassStatusPill, RenewControl, SnippetBox } from './pass-parts';
import { useClient } from './use-clients';

export interface GrantableWidget {
  id: string;
  title: string;
  modelTitle: string;
  versionNumber: number;
}

type Notice = { tone: 'success' | 'danger'; text: string } | null;

function GrantForm({ widgets, taken, onGrant }: { widgets: GrantableWidget[]; taken: Set<string>; onGrant: (b: { widgetId: string; days: number }) => Promise<unknown> }) {
  const free = widgets.filter((w) => !taken.has(w.id));
  const [widgetId, setWidgetId] = useState(free[0]?.id ?? '');
  const [days, setDays] = useState(String(PASS_DEFAULT_DAYS));
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  if (!widgets.length) {
    return <p className="text-sm text-ink-700">No widget is published yet. Publish a checked model version from Models, then grant it here.</p>;
  }
  if (!free.length) return <p className="text-sm text-ink-700">This client already has a live pass for every published widget. Renew a pass below to extend it.</p>;
  const n = Number(days);
  const validDays = Number.isInteger(n) && n >= 1 && n <= PASS_MAX_DAYS;
  return (
    <form
      noValidate
      className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_9rem_auto] sm:items-start"
      onSubmit={async (e) => {
        e.preventDefault();
        if (!validDays || !widgetId) return;
        setPending(true);
        setError(null);
        try {
          await onGrant({ widgetId, days: n });
          setWidgetId(free.find((w) => w.id !== widgetId)?.id ?? '');
        } catch (err) {
          setError(errorMessage(err));
        } finally {
          setPending(false);
        }
      }}
    >
      <Select
        label="Published widget"
        options={free.map((w) => ({ value: w.id, label: `${w.title} (version ${w.versionNumber})` }))}
        value={widgetId}
        onChange={(e) => setWidgetId(e.target.value)}
      />
      <NumberField label="Valid for" unit="days" min={1} max={PASS_MAX_DAYS} step={1} value={days} onChange={(e) => setDays(e.target.value)} error={validDays ? undefined : `Whole days, 1 to ${PASS_MAX_DAYS}.`} />
      <Button type="submit" pending={pending} pendingLabel="Granting…" className="sm:mt-6" disabled={!validDays}>
        Grant widget
      </Button>
      {error ? <p className="text-sm text-danger-700 sm:col-span-3">{error}</p> : null}
    </form>
  );
}

function PassItem({ pass, clientId, canManage, onRenew, onRevoke }: { pass: PassView; clientId: string; canManage: boolean; onRenew: (b: { days: number; retirePrevious: boolean }) => Promise<unknown>; onRevoke: () => Promise<unknown> }) {
  const live = pass.status !== 'revoked' && pass.status !== 'key_rotated';
  return (
    <li className="space-y-3 rounded-lg border border-ink-200 bg-white p-4" aria-labelledby={`pass-${pass.id}`}>
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`pass-${pass.id}`} className="font-semibold text-ink-900">
            {pass.widgetTitle}
          </h3>
          <p className="text-xs text-ink-600">
            Granted <DateText iso={pass.createdAt} mode="absolute" />
            {pass.createdByName ? ` by ${pass.createdByName}` : ''}
            {pass.revokedAt ? (
              <>
                {' '}
                · revoked <DateText iso={pass.revokedAt} mode="absolute" />
              </>
            ) : (
              <>
                {' '}
                · {pass.status === 'expired' ? 'expired' : 'expires'} <DateText iso={pass.expiresAt} mode="absolute" />
              </>
            )}
          </p>
        </div>
        <PassStatusPill pass={pass} />
      </div>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <PassCounts counts={pass.counts} />
        <p className="text-sm text-ink-700">
          Last view: <DateText iso={pass.lastViewAt} empty="never" />
        </p>
      </div>
      <SnippetBox pass={pass} />
      <div className="flex flex-wrap items-start gap-2">
        <Link href={`/app/clients/${clientId}/passes/${pass.id}`} className="inline-flex h-8 items-center rounded-md px-3 text-sm font-medium text-accent-800 underline decoration-accent-300 hover:decoration-accent-700">
          Views and details
        </Link>
        {canManage && live ? <RenewControl pass={pass} onRenew={onRenew} /> : null}
        {canManage && live ? (
          <ConfirmButton ariaLabel={`Revoke the pass for ${pass.widgetTitle}`} prompt="Revoke? The widget stops on the client’s next page load or dial move." confirmLabel="Yes, revoke" pendingLabel="Revoking…" onConfirm={onRevoke}>
            Revoke
          </ConfirmButton>
        ) : null}
      </div>
    </li>
  );
}

export function ClientDetail({ id, canManage, widgets }: { id: string; canManage: boolean; widgets: GrantableWidget[] }) {
  const c = useClient(id);
  const [editing, setEditing] = useState(false);
  const [notice, setNotice] = useState<Notice>(null);

  async function act(run: () => Promise<unknown>, done: string) {
    setNotice(null);
    try {
      await run();
      setNotice({ tone: 'success', text: done });
    } catch (err) {
      setNotice({ tone: 'danger', text: errorMessage(err) });
      throw err;
    }
  }

  if (c.error) return <LoadError error={c.error} what="this client" onRetry={() => c.mutate()} />;
  if (!c.data) return <Loading>Loading the client…</Loading>;
  const { client, passes } = c.data;
  const taken = new Set(passes.filter((p) => p.status === 'active' || p.status === 'expiring' || p.status === 'suspended' || p.status === 'unpublished').map((p) => p.widgetId));

  return (
    <div className="space-y-6">
      <PageHeader
        eyebrow={
          <Link href="/app/clients" className="text-accent-800 underline decoration-accent-300">
            Clients
          </Link>
        }
        title={client.name}
        description={client.note ?? undefined}
        actions={client.archivedAt ? <StatusPill kind="stopped">Archived</StatusPill> : <StatusPill kind="ok">Active</StatusPill>}
      />
      {notice ? (
        <Banner tone={notice.tone} title={notice.tone === 'success' ? 'Done' : 'That did not work'}>
          {notice.text}
        </Banner>
      ) : null}
      {client.archivedAt ? (
        <Banner tone="warn" title="This client is archived">
          Its passes are suspended: the widgets show a short notice instead of the model. Restore the client to let them work again.
        </Banner>
      ) : null}

      <Card
        title="Access"
        description="Where this client’s widgets may appear and who may receive snapshots."
        actions={
          canManage && !editing ? (
            <Button size="sm" variant="secondary" onClick={() => setEditing(true)}>
              Edit
            </Button>
          ) : null
        }
      >
        {editing ? (
          <ClientForm
            initial={client}
            submitLabel="Save changes"
            onCancel={() => setEditing(false)}
            onSubmit={async (body) => {
              await c.update(body);
              setEditing(false);
              setNotice({ tone: 'success', text: 'Saved. The new origins apply to the next page load of each widget.' });
            }}
          />
        ) : (
          <dl className="grid gap-4 sm:grid-cols-2">
            <div>
              <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">Allowed origins</dt>
              <dd>
                <ul className="num mt-1 space-y-0.5 text-sm text-ink-800">
                  {client.allowedOrigins.map((o) => (
                    <li key={o} className="break-all">
                      {o}
                    </li>
                  ))}
                </ul>
              </dd>
            </div>
            <div>
              <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">Allowed e-mail domains</dt>
              <dd className="mt-1 text-sm text-ink-800">
                {client.snapshotAnyAddress ? (
                  <span className="font-medium text-warn-700">Any address: snapshots go wherever a viewer asks (not recommended).</span>
                ) : client.allowedEmailDomains.length ? (
                  client.allowedEmailDomains.join(', ')
                ) : (
                  'None: snapshots cannot be sent to this client.'
                )}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">Signing key</dt>
              <dd className="mt-1 text-sm text-ink-800">
                Version <span className="num">{client.keyVersion}</span>, in use since <DateText iso={client.keyRotatedAt} mode="absolute" />
              </dd>
            </div>
          </dl>
        )}
        {canManage && !editing ? (
          <div className="mt-5 flex flex-wrap gap-2 border-t border-ink-100 pt-4">
            <ConfirmButton
              ariaLabel="Rotate this client’s key"
              prompt="Rotate the key? Every pass of this client is revoked at once; you then grant the widgets again and send the new snippets."
              confirmLabel="Yes, rotate"
              pendingLabel="Rotating…"
              onConfirm={() =>
                act(async () => {
                  const r = await c.rotateKey();
                  return r;
                }, 'Key rotated. Every earlier snippet of this client stopped working; grant the widgets again for new ones.')
              }
            >
              Rotate key
            </ConfirmButton>
            {client.archivedAt ? (
              <Button size="sm" variant="secondary" onClick={() => act(() => c.update({ archived: false }), `${client.name} is active again; its live passes work again.`).catch(() => undefined)}>
                Restore client
              </Button>
            ) : (
              <ConfirmButton
                ariaLabel="Archive this client"
                prompt="Archive? Its widgets stop showing until you restore it."
                confirmLabel="Yes, archive"
                pendingLabel="Archiving…"
                onConfirm={() => act(() => c.update({ archived: true }), `${client.name} is archived; its passes are suspended.`)}
              >
                Archive client
              </ConfirmButton>
            )}
          </div>
        ) : null}
      </Card>

      {canManage && !client.archivedAt ? (
        <Card title="Grant a widget" description="Issues a pass: a signed, expiring snippet that shows one published widget to this client only.">
          <GrantForm widgets={widgets} taken={taken} onGrant={(b) => act(() => c.grant(b), 'Pass issued. Copy its snippet below and send it to the client’s web team.')} />
        </Card>
      ) : null}

      <section aria-labelledby="passes-heading" className="space-y-3">
        <h2 id="passes-heading" className="text-lg font-semibold text-ink-900">
          Passes
        </h2>
        {passes.length ? (
          <ul className="space-y-3">
            {passes.map((p) => (
              <PassItem
                key={p.id}
                pass={p}
                clientId={client.id}
                canManage={canManage}
                onRenew={(b) => act(() => c.renew(p.id, b), `Renewed until the new date. The snippet shown is new; copy it for the client.`)}
                onRevoke={() => act(() => c.revoke(p.id), `The pass for “${p.widgetTitle}” is revoked.`)}
              />
            ))}
          </ul>
        ) : (
          <EmptyState title="No passes yet" as="h3">
            <p>{canManage ? 'Grant a published widget above: the pass gives you the snippet to send to the client.' : 'Authors and the account owner grant widgets to clients.'}</p>
          </EmptyState>
        )}
      </section>
    </div>
  );
}
