'use client';

import Link from 'next/link';
import { useState } from 'react';
import { errorMessage } from '@/lib/client/api';
import { Card } from '@/components/ui/card';
import { Banner } from '@/components/ui/banner';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { DateText } from '@/components/ui/date-text';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { PageHeader } from '@/components/ui/page-header';
import { PassCounts, PassStatusPill, RenewControl, SnippetBox } from './pass-parts';
import { ViewsChart } from './views-chart';
import { usePass } from './use-clients';

export function PassDetail({ id, clientId, canManage }: { id: string; clientId: string; canManage: boolean }) {
  const p = usePass(id);
  const [notice, setNotice] = useState<{ tone: 'success' | 'danger'; text: string } | null>(null);
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
  if (p.error) return <LoadError error={p.error} what="this pass" onRetry={() => p.mutate()} />;
  if (!p.data) return <Loading>Loading the pass…</Loading>;
  const pass = p.data.pass;
  const live = pass.status !== 'revoked' && pass.status !== 'key_rotated';
  return (
    <div className="space-y-6">
      <PageHeader
        eyebrow={
          <span className="flex gap-1.5">
            <Link href="/app/clients" className="text-accent-800 underline decoration-accent-300">
              Clients
            </Link>
            <span aria-hidden="true">/</span>
            <Link href={`/app/clients/${clientId}`} className="text-accent-800 underline decoration-accent-300">
              {pass.clientName}
            </Link>
          </span>
        }
        title={`Pass: ${pass.widgetTitle}`}
        actions={<PassStatusPill pass={pass} />}
      />
      {notice ? (
        <Banner tone={notice.tone} title={notice.tone === 'success' ? 'Done' : 'That did not work'}>
          {notice.text}
        </Banner>
      ) : null}
      <Card title="Views" description="Loads of the widget, dial interactions and snapshot requests, per day over the last 30 days. No personal data is kept.">
        <div className="space-y-4">
          <div className="flex flex-wrap items-center justify-between gap-3">
            <PassCounts counts={pass.counts} />
            <p className="text-sm text-ink-700">
              Last view: <DateText iso={pass.lastViewAt} empty="never" />
            </p>
          </div>
          <ViewsChart daily={pass.daily} />
        </div>
      </Card>
      <Card title="Snippet and validity">
        <div className="space-y-4">
          <p className="text-sm text-ink-700">
            Granted <DateText iso={pass.createdAt} mode="absolute" />
            {pass.createdByName ? ` by ${pass.createdByName}` : ''}.{' '}
            {pass.revokedAt ? (
              <>
                Revoked <DateText iso={pass.revokedAt} mode="absolute" />.
              </>
            ) : (
              <>
                {pass.status === 'expired' ? 'Expired' : 'Expires'} <DateText iso={pass.expiresAt} mode="absolute" />
                {pass.renewedAt ? (
                  <>
                    {' '}
                    (renewed <DateText iso={pass.renewedAt} mode="absolute" />)
                  </>
                ) : null}
                .
              </>
            )}
          </p>
          <SnippetBox pass={pass} />
          {canManage && live ? (
            <div className="flex flex-wrap items-start gap-2">
              <RenewControl pass={pass} onRenew={(b) => act(() => p.renew(b), 'Renewed. The snippet shown is new; copy it for the client.')} />
              <ConfirmButton ariaLabel="Revoke this pass" prompt="Revoke? The widget stops on the client’s next page load or dial move." confirmLabel="Yes, revoke" pendingLabel="Revoking…" onConfirm={() => act(() => p.revoke(), 'The pass is revoked.')}>
                Revoke
              </ConfirmButton>
            </div>
          ) : null}
        </div>
      </Card>
    </div>
  );
}
