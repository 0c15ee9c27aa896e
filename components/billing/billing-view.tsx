'use client';

import Link from 'next/link';
import { useEffect, useRef, useState } from 'react';
import { errorMessage } from '@/lib/client/api';
import { formatMoney } from '@/lib/core/billing/money';
import { Banner } from '@/components/ui/banner';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { PageHeader } from '@/components/ui/page-header';
import { StatusPill, type StatusKind } from '@/components/ui/badge';
import { useBilling, type BillingSummary } from './use-billing';
import { BuySeatsForm, ChangeSeatsForm } from './seat-forms';
import { STATUS_LABEL, STATUS_PILL, billingDate, statusSentence } from './status-words';

type Invoice = BillingSummary['invoices'][number];

const INVOICE_STATUS: Record<Invoice['status'], [StatusKind, string]> = {
  paid: ['ok', 'Paid'],
  failed: ['warn', 'Payment failed'],
  open: ['waiting', 'Open'],
  draft: ['waiting', 'Draft'],
  void: ['stopped', 'Void'],
  uncollectible: ['stopped', 'Uncollectible'],
};

const invoiceColumns: Column<Invoice>[] = [
  { key: 'date', header: 'Date', sortValue: (i) => i.createdAt, cell: (i) => billingDate(i.createdAt) },
  { key: 'number', header: 'Number', cell: (i) => <span className="num">{i.number ?? '—'}</span>, hideBelow: 'sm' },
  {
    key: 'status',
    header: 'Status',
    sortValue: (i) => i.status,
    cell: (i) => <StatusPill kind={INVOICE_STATUS[i.status][0]}>{INVOICE_STATUS[i.status][1]}</StatusPill>,
  },
  { key: 'seats', header: 'Seats', numeric: true, cell: (i) => i.seats ?? '—', hideBelow: 'md' },
  {
    key: 'period',
    header: 'Period',
    cell: (i) => (i.periodStart && i.periodEnd && i.periodStart !== i.periodEnd ? `${billingDate(i.periodStart)} – ${billingDate(i.periodEnd)}` : billingDate(i.periodStart)),
    hideBelow: 'lg',
  },
  {
    key: 'amount',
    header: 'Amount',
    numeric: true,
    sortValue: (i) => i.total,
    cell: (i) => formatMoney(i.status === 'paid' ? i.amountPaid : i.total, i.currency),
  },
  {
    key: 'link',
    header: <span className="sr-only">Invoice page</span>,
    cell: (i) =>
      i.hostedInvoiceUrl ? (
        <a href={i.hostedInvoiceUrl} target="_blank" rel="noreferrer" className="font-medium text-accent-800 underline">
          {i.status === 'failed' || i.status === 'open' ? 'Pay' : 'View'}
          <span className="sr-only"> invoice {i.number ?? ''}</span>
        </a>
      ) : null,
  },
];

function Fact({ term, children }: { term: string; children: React.ReactNode }) {
  return (
    <div className="min-w-0">
      <dt className="text-xs font-semibold tracking-wide text-ink-600 uppercase">{term}</dt>
      <dd className="mt-1 text-[0.9375rem] text-ink-900">{children}</dd>
    </div>
  );
}

export function BillingView({ returnedFrom }: { returnedFrom: 'checkout-success' | 'checkout-cancelled' | 'portal' | null }) {
  const billing = useBilling();
  const { data, error, mutate, wait, refreshFor } = billing;
  const [notice, setNotice] = useState<{ tone: 'success' | 'danger' | 'info'; text: string } | null>(
    returnedFrom === 'checkout-cancelled' ? { tone: 'info', text: 'Checkout was left without paying. Nothing was charged and nothing changed.' } : null,
  );
  const [busy, setBusy] = useState<'portal' | null>(null);
  const started = useRef(false);

  // Coming back from Stripe's pages: the webhook may still be on its way, so wait for its effect.
  useEffect(() => {
    if (started.current) return;
    started.current = true;
    if (returnedFrom === 'checkout-success') {
      wait({
        until: (s) => s.subscription !== null && s.invoices.length > 0,
        done: 'Payment received: your seats are ready. Invite authors and checkers on the Team page.',
        late: 'The payment went through; the seats appear here as soon as the payment provider confirms it. Reload in a minute.',
      });
    } else if (returnedFrom === 'portal') {
      refreshFor(15);
    }
    if (returnedFrom) window.history.replaceState(null, '', '/app/billing');
  }, [returnedFrom, wait, refreshFor]);

  async function goToPortal() {
    setNotice(null);
    setBusy('portal');
    try {
      const { url } = await billing.portal();
      window.location.assign(url);
    } catch (err) {
      setNotice({ tone: 'danger', text: errorMessage(err) });
      setBusy(null);
    }
  }

  async function act(run: () => Promise<unknown>, then: () => void) {
    setNotice(null);
    try {
      await run();
      then();
    } catch (err) {
      setNotice({ tone: 'danger', text: errorMessage(err) });
      throw err;
    }
  }

  const header = (
    <PageHeader
      title="Billing"
      description="Seats for authors and checkers, paid monthly. The account owner and client viewers take no seat."
      actions={
        data ? (
          <Button variant="secondary" onClick={goToPortal} pending={busy === 'portal'} pendingLabel="Opening portal…">
            Manage in portal
          </Button>
        ) : null
      }
    />
  );

  if (error) return (<>{header}<LoadError error={error} what="billing" onRetry={() => void mutate()} /></>);
  if (!data) return (<>{header}<Loading>Loading billing…</Loading></>);

  const s = data.status;
  const sub = data.subscription;
  const live = sub !== null && ['active', 'trialing', 'past_due'].includes(sub.status);
  const over = data.seats.paid !== null && data.seats.used > data.seats.paid;
  const shown = billing.awaiting ? { tone: 'info' as const, text: 'Waiting for the payment provider to confirm…' } : (billing.settled ?? notice);

  return (
    <>
      {header}
      <div className="space-y-5">
        {shown ? (
          <Banner tone={shown.tone} title={shown.tone === 'danger' ? 'That did not work' : undefined}>
            {shown.text}
          </Banner>
        ) : null}
        {data.providerError ? (
          <Banner tone="warn" title="The payment provider is not answering">
            {data.providerError} Your seats and invoices below are as last reported.
          </Banner>
        ) : null}
        {over ? (
          <Banner tone="warn" title="More members than paid seats">
            {data.seats.used} authors and checkers use seats but {data.seats.paid} are paid. No one new can join until you add seats or remove members on the{' '}
            <Link href="/app/team">Team page</Link>.
          </Banner>
        ) : null}

        <Card title="Plan and seats" id="plan">
          <dl className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
            <Fact term="Plan">
              {data.plan ? (
                <>
                  {data.plan.name}
                  <span className="block text-sm text-ink-600">
                    {formatMoney(data.plan.unitAmount, data.plan.currency)} per seat per {data.plan.interval}
                  </span>
                </>
              ) : (
                <span className="text-ink-600">Price unavailable</span>
              )}
            </Fact>
            <Fact term="Status">
              <StatusPill kind={STATUS_PILL[s.kind]}>{STATUS_LABEL[s.kind]}</StatusPill>
            </Fact>
            <Fact term="Seats">
              <span className="num" data-testid="seats-summary">
                {data.seats.paid !== null ? `${data.seats.paid} paid` : `${data.seats.allowed} included`} · {data.seats.used} in use
              </span>
              {data.seats.pendingInvitations ? <span className="block text-sm text-ink-600">{data.seats.pendingInvitations} invitation{data.seats.pendingInvitations === 1 ? '' : 's'} pending</span> : null}
            </Fact>
            <Fact term="Next invoice">
              {data.upcoming ? (
                <>
                  <span className="num">{formatMoney(data.upcoming.amount, data.upcoming.currency)}</span>
                  <span className="block text-sm text-ink-600">on {billingDate(data.upcoming.date)}</span>
                </>
              ) : s.kind === 'canceling' ? (
                <span className="text-ink-700">None: ends {billingDate(s.periodEnd)}</span>
              ) : (
                <span className="text-ink-600">—</span>
              )}
            </Fact>
          </dl>
          <p className="mt-4 text-sm text-ink-700">{statusSentence(s)}</p>
          <p className="mt-1 text-xs text-ink-600">
            Payments run through {data.provider === 'stripe' ? 'Stripe' : 'the local payment fake (test cards only: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined)'}.
          </p>
        </Card>

        {live ? (
          <Card title={<span id="change-heading">Change seats</span>} description="Adding seats charges the rest of this period now; removing seats credits the unused time to later invoices.">
            <ChangeSeatsForm
              summary={data}
              onPreview={billing.preview}
              onConfirm={async (p) => {
                await billing.changeSeats({ seats: p.seats, prorationDate: p.prorationDate, quote: p.quote });
                wait({
                  until: (x) => x.subscription?.quantity === p.seats,
                  done: `You now have ${p.seats} seats.`,
                  late: `The payment provider accepted the change to ${p.seats} seats; it shows here once confirmed.`,
                });
              }}
            />
          </Card>
        ) : (
          <Card title={<span id="buy-heading">Buy seats</span>} description="One seat per author or checker. The subscription renews monthly; change or cancel it here at any time.">
            <BuySeatsForm summary={data} onCheckout={billing.checkout} />
          </Card>
        )}

        {live && sub ? (
          <Card title="Cancel or resume" description="Cancelling takes effect at the end of the paid period; seats and editing keep working until then.">
            {sub.cancelAtPeriodEnd ? (
              <div className="flex flex-wrap items-center gap-3">
                <p className="text-sm text-ink-700">The subscription ends on {billingDate(sub.currentPeriodEnd)}.</p>
                <Button
                  variant="secondary"
                  onClick={() =>
                    act(billing.resume, () =>
                      wait({ until: (x) => x.subscription?.cancelAtPeriodEnd === false, done: 'The subscription continues; nothing else changed.', late: 'Resuming was accepted; it shows here once confirmed.' }),
                    ).catch(() => undefined)
                  }
                >
                  Resume subscription
                </Button>
              </div>
            ) : (
              <ConfirmButton
                prompt={`End the subscription on ${billingDate(sub.currentPeriodEnd)}?`}
                confirmLabel="Yes, cancel at period end"
                onConfirm={() =>
                  act(billing.cancel, () =>
                    wait({
                      until: (x) => x.subscription?.cancelAtPeriodEnd === true,
                      done: `Cancelled: everything keeps working until ${billingDate(sub.currentPeriodEnd)}.`,
                      late: 'The cancellation was accepted; it shows here once confirmed.',
                    }),
                  )
                }
              >
                Cancel at period end
              </ConfirmButton>
            )}
          </Card>
        ) : null}

        <Card title="Invoices" bodyClassName="p-0 sm:p-0">
          <DataTable
            caption="Invoices"
            columns={invoiceColumns}
            rows={data.invoices}
            rowKey={(i) => i.id}
            className="rounded-none border-0"
            empty={
              <EmptyState as="h3" title="No invoices yet" className="m-4">
                Invoices appear here once you buy seats: one when you subscribe, one each month, and one when you add seats.
              </EmptyState>
            }
          />
        </Card>
      </div>
    </>
  );
}
