'use client';

import { useState } from 'react';
import { ApiError, errorMessage } from '@/lib/client/api';
import { seatsField } from '@/lib/core/billing/schemas';
import { formatMoney } from '@/lib/core/billing/money';
import { Button } from '@/components/ui/button';
import { NumberField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import type { BillingSummary, SeatPreview } from './use-billing';
import { billingDate } from './status-words';

/** Reads the seat input; returns the number or the message to show beside the field. */
function parseSeats(raw: string): { seats: number } | { error: string } {
  const parsed = seatsField.safeParse(raw.trim() === '' ? NaN : Number(raw));
  return parsed.success ? { seats: parsed.data } : { error: parsed.error.issues[0]?.message ?? 'Enter a number of seats.' };
}

function splitError(err: unknown): { field?: string; form?: string } {
  if (err instanceof ApiError && err.fields?.seats?.length) return { field: err.fields.seats.join(' ') };
  return { form: errorMessage(err) };
}

export function BuySeatsForm({ summary, onCheckout }: { summary: BillingSummary; onCheckout: (seats: number) => Promise<{ url: string }> }) {
  const needed = Math.max(summary.limits.min, summary.seats.used + summary.seats.pendingInvitations);
  const [value, setValue] = useState(String(needed));
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [formError, setFormError] = useState<string | undefined>();
  const [pending, setPending] = useState(false);
  const plan = summary.plan;
  const parsed = parseSeats(value);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setFormError(undefined);
    const p = parseSeats(value);
    if ('error' in p) return setFieldError(p.error);
    setFieldError(undefined);
    setPending(true);
    try {
      const { url } = await onCheckout(p.seats);
      // Off to the payment page; it sends the browser back to this page when done.
      window.location.assign(url);
    } catch (err) {
      const { field, form } = splitError(err);
      setFieldError(field);
      setFormError(form);
      setPending(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="buy-heading" className="space-y-3">
      <FormError messages={formError ? [formError] : []} />
      <div className="flex flex-wrap items-start gap-3">
        <NumberField
          label="Number of seats"
          type="number"
          min={summary.limits.min}
          max={summary.limits.max}
          step={1}
          inputMode="numeric"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          error={fieldError}
          unit="seats"
          className="w-48"
          hint={`${summary.seats.used} in use now${summary.seats.pendingInvitations ? `, ${summary.seats.pendingInvitations} invited` : ''}. From ${summary.limits.min} to ${summary.limits.max}.`}
        />
        <Button type="submit" pending={pending} pendingLabel="Opening checkout…" className="sm:mt-6" disabled={!plan}>
          Buy seats
        </Button>
      </div>
      {plan && !('error' in parsed) ? (
        <p className="text-sm text-ink-700">
          {parsed.seats} × {formatMoney(plan.unitAmount, plan.currency)} = <span className="num font-medium text-ink-900">{formatMoney(parsed.seats * plan.unitAmount, plan.currency)}</span> per {plan.interval},
          charged now and then every {plan.interval}. You enter the card on the payment page.
        </p>
      ) : null}
    </form>
  );
}

export function ChangeSeatsForm({
  summary,
  onPreview,
  onConfirm,
}: {
  summary: BillingSummary;
  onPreview: (seats: number) => Promise<SeatPreview>;
  onConfirm: (p: SeatPreview) => Promise<void>;
}) {
  const current = summary.subscription?.quantity ?? 1;
  const [value, setValue] = useState(String(current));
  const [preview, setPreview] = useState<SeatPreview | null>(null);
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [formError, setFormError] = useState<string | undefined>();
  const [pending, setPending] = useState<'preview' | 'confirm' | null>(null);

  async function askPreview(e: React.FormEvent) {
    e.preventDefault();
    setFormError(undefined);
    setPreview(null);
    const p = parseSeats(value);
    if ('error' in p) return setFieldError(p.error);
    if (p.seats === current) return setFieldError(`You already pay for ${current} seat${current === 1 ? '' : 's'}.`);
    setFieldError(undefined);
    setPending('preview');
    try {
      setPreview(await onPreview(p.seats));
    } catch (err) {
      const { field, form } = splitError(err);
      setFieldError(field);
      setFormError(form);
    } finally {
      setPending(null);
    }
  }

  async function confirm() {
    if (!preview) return;
    setFormError(undefined);
    setPending('confirm');
    try {
      await onConfirm(preview);
      setPreview(null);
    } catch (err) {
      const { field, form } = splitError(err);
      setFieldError(field);
      setFormError(form);
    } finally {
      setPending(null);
    }
  }

  const up = preview ? preview.seats > preview.currentSeats : false;
  return (
    <div className="space-y-3">
      <form onSubmit={askPreview} noValidate aria-labelledby="change-heading" className="space-y-3">
        <FormError messages={formError ? [formError] : []} />
        <div className="flex flex-wrap items-start gap-3">
          <NumberField
            label="New number of seats"
            type="number"
            min={summary.limits.min}
            max={summary.limits.max}
            step={1}
            inputMode="numeric"
            value={value}
            onChange={(e) => {
              setValue(e.target.value);
              setPreview(null);
            }}
            error={fieldError}
            unit="seats"
            className="w-48"
            hint={`Now ${current}; ${summary.seats.used} in use${summary.seats.pendingInvitations ? `, ${summary.seats.pendingInvitations} invited` : ''}.`}
          />
          <Button type="submit" variant="secondary" pending={pending === 'preview'} pendingLabel="Working out the price…" className="sm:mt-6">
            Preview change
          </Button>
        </div>
      </form>
      {preview ? (
        <section aria-labelledby="preview-heading" className="rounded-md border border-ink-200 bg-ink-50 px-4 py-3 text-sm text-ink-800">
          <h3 id="preview-heading" className="font-semibold text-ink-900">
            {preview.currentSeats} → {preview.seats} seats
          </h3>
          <ul className="mt-2 space-y-1">
            {preview.lines.map((l, i) => (
              <li key={i} className="flex justify-between gap-4">
                <span>{l.description}</span>
                <span className="num whitespace-nowrap">{formatMoney(l.amount, preview.currency)}</span>
              </li>
            ))}
          </ul>
          <p className="mt-2 font-medium text-ink-900">
            {up
              ? `Charged now to the card on file: ${formatMoney(preview.dueNow, preview.currency)} for the rest of the period (to ${billingDate(preview.periodEnd)}).`
              : preview.prorationTotal < 0
                ? `Nothing is charged now; ${formatMoney(-preview.prorationTotal, preview.currency)} of unused time becomes a credit used on your next invoices.`
                : `Charged now: ${formatMoney(preview.dueNow, preview.currency)}.`}
          </p>
          {preview.nextPeriodAmount != null ? <p className="mt-1 text-ink-700">From then on: {formatMoney(preview.nextPeriodAmount, preview.currency)} per month.</p> : null}
          <div className="mt-3 flex flex-wrap gap-2">
            <Button onClick={confirm} pending={pending === 'confirm'} pendingLabel="Changing seats…">
              Confirm change
            </Button>
            <Button variant="ghost" disabled={pending === 'confirm'} onClick={() => setPreview(null)}>
              Back
            </Button>
          </div>
        </section>
      ) : null}
    </div>
  );
}
