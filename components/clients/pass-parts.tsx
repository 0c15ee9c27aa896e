'use client';

import { useId, useState } from 'react';
import { StatusPill, type StatusKind } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { CopyButton } from '@/components/ui/copy-button';
import { NumberField, Checkbox } from '@/components/ui/field';
import { errorMessage } from '@/lib/client/api';
import type { PassStatus } from '@/lib/core/embed/status';
import { PASS_DEFAULT_DAYS, PASS_MAX_DAYS } from '@/lib/core/embed/schemas';
import type { PassView } from '@/lib/core/embed/views';

const KIND: Record<PassStatus, StatusKind> = {
  active: 'ok',
  expiring: 'warn',
  expired: 'stopped',
  revoked: 'stopped',
  key_rotated: 'stopped',
  suspended: 'warn',
  unpublished: 'warn',
};

export function PassStatusPill({ pass }: { pass: Pick<PassView, 'status' | 'statusLabel'> }) {
  return <StatusPill kind={KIND[pass.status]}>{pass.statusLabel}</StatusPill>;
}

export function PassCounts({ counts }: { counts: PassView['counts'] }) {
  return (
    <dl className="num flex flex-wrap gap-x-5 gap-y-1 text-sm">
      {(
        [
          ['Loads', counts.load],
          ['Dial moves', counts.dial],
          ['Snapshots', counts.snapshot],
        ] as const
      ).map(([k, v]) => (
        <div key={k} className="flex items-baseline gap-1.5">
          <dt className="font-sans text-xs text-ink-600">{k}</dt>
          <dd className="font-semibold text-ink-900">{v.toLocaleString('en-GB')}</dd>
        </div>
      ))}
    </dl>
  );
}

/** The snippet in a read-only box with a copy button, and what to do with it. */
export function SnippetBox({ pass }: { pass: PassView }) {
  const id = useId();
  if (!pass.snippet) {
    return <p className="text-sm text-ink-600">This pass can no longer be used, so its snippet is hidden. Grant the widget again to get a new one.</p>;
  }
  return (
    <div className="space-y-1.5">
      <div className="flex items-center justify-between gap-2">
        <label htmlFor={id} className="text-sm font-medium text-ink-800">
          Snippet for {pass.clientName}’s web team
        </label>
        <CopyButton value={pass.snippet} label="Copy snippet" what={`for ${pass.widgetTitle}`} />
      </div>
      <textarea
        id={id}
        readOnly
        value={pass.snippet}
        rows={4}
        onFocus={(e) => e.currentTarget.select()}
        className="num block w-full resize-none rounded-md border border-ink-300 bg-ink-50 px-3 py-2 text-xs text-ink-800"
      />
      <p className="text-xs text-ink-600">
        Paste it where the widget should appear on a page at one of the client’s allowed origins. Several snippets may share a page; the script line is only needed once.
        {pass.olderSnippetsLive > 0 ? ` ${pass.olderSnippetsLive} older snippet${pass.olderSnippetsLive === 1 ? '' : 's'} of this pass still work${pass.olderSnippetsLive === 1 ? 's' : ''} until ${pass.olderSnippetsLive === 1 ? 'its' : 'their'} own expiry.` : ''}
      </p>
    </div>
  );
}

/** Renew: a new expiry (default 90 days from today) and a new snippet. */
export function RenewControl({ pass, onRenew }: { pass: PassView; onRenew: (body: { days: number; retirePrevious: boolean }) => Promise<unknown> }) {
  const [open, setOpen] = useState(false);
  const [days, setDays] = useState(String(PASS_DEFAULT_DAYS));
  const [retire, setRetire] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  if (!open) {
    return (
      <Button size="sm" variant="secondary" aria-label={`Renew the pass for ${pass.widgetTitle}`} onClick={() => setOpen(true)}>
        Renew
      </Button>
    );
  }
  const n = Number(days);
  const valid = Number.isInteger(n) && n >= 1 && n <= PASS_MAX_DAYS;
  return (
    <form
      className="flex flex-wrap items-end gap-3 rounded-md bg-ink-50 p-3 ring-1 ring-ink-200"
      onSubmit={async (e) => {
        e.preventDefault();
        if (!valid) return;
        setPending(true);
        setError(null);
        try {
          await onRenew({ days: n, retirePrevious: retire });
          setOpen(false);
        } catch (err) {
          setError(errorMessage(err));
        } finally {
          setPending(false);
        }
      }}
    >
      <NumberField
        label="Valid for"
        unit="days"
        min={1}
        max={PASS_MAX_DAYS}
        step={1}
        value={days}
        onChange={(e) => setDays(e.target.value)}
        error={valid ? undefined : `Enter whole days from 1 to ${PASS_MAX_DAYS}.`}
        className="w-36"
      />
      <Checkbox label="Stop the current snippet now" hint="Otherwise it keeps working until its own expiry, giving the web team time to paste the new one." checked={retire} onChange={(e) => setRetire(e.target.checked)} />
      <div className="flex gap-2">
        <Button type="submit" size="sm" pending={pending} pendingLabel="Renewing…" disabled={!valid}>
          Renew pass
        </Button>
        <Button size="sm" variant="ghost" onClick={() => setOpen(false)} disabled={pending}>
          Cancel
        </Button>
      </div>
      {error ? <p className="w-full text-sm text-danger-700">{error}</p> : null}
    </form>
  );
}
