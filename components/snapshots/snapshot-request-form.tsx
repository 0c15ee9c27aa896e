'use client';

import { useContext, useId, useState, type FormEvent } from 'react';
import { PinnedViewContext } from '@/components/widget/pin-context';

// "E-mail this view" inside the embed: an address, a send button, and the server's answer in plain words
// (domain refusals, limits with their retry time). `send` posts with the embed page's bearer token.

export interface SnapshotRequestFormProps {
  /** Posts { email, dialValues, pinnedDialValues?, version } to /api/embed/passes/[id]/snapshots with the bearer; resolves to the answer in words. */
  send: (body: { email: string; dialValues: Record<string, number>; pinnedDialValues?: Record<string, number>; version?: number }) => Promise<{ ok: boolean; message: string | null }>;
  dialValues: Record<string, number>;
  version?: number;
}

type Phase = { kind: 'idle' } | { kind: 'sending' } | { kind: 'sent'; message: string } | { kind: 'error'; message: string };

export function SnapshotRequestForm({ send, dialValues, version }: SnapshotRequestFormProps) {
  const [open, setOpen] = useState(false);
  const [email, setEmail] = useState('');
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const id = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  // With a pinned view, the PDF shows both views side by side.
  const pinned = useContext(PinnedViewContext);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setPhase({ kind: 'sending' });
    const answer = await send({ email, dialValues, version, ...(pinned ? { pinnedDialValues: pinned } : {}) });
    if (answer.ok) setPhase({ kind: 'sent', message: answer.message ?? `On its way to ${email}.` });
    else setPhase({ kind: 'error', message: answer.message ?? 'The request could not be sent. Check the connection and try again.' });
  }

  if (!open)
    return (
      <button type="button" onClick={() => setOpen(true)} className="inline-flex h-8 items-center rounded-md border border-ink-300 bg-white px-3 text-[0.8125rem] font-medium shadow-sm hover:border-ink-500" style={{ color: 'var(--st-brand-text)' }}>
        E-mail this view
      </button>
    );
  if (phase.kind === 'sent')
    return (
      <p role="status" className="text-sm text-ink-800">
        {phase.message}
      </p>
    );
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2" noValidate>
      <div className="flex flex-col">
        <label htmlFor={`${id}-email`} className="text-xs font-medium text-ink-700">
          {pinned ? 'Send a PDF of both views (pinned and current) to' : 'Send a PDF of this view to'}
        </label>
        <input
          id={`${id}-email`}
          type="email"
          autoComplete="email"
          required
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          aria-invalid={phase.kind === 'error' || undefined}
          aria-describedby={phase.kind === 'error' ? `${id}-error` : undefined}
          className="h-8 w-64 rounded-md border border-ink-300 px-2 text-sm"
        />
      </div>
      <button type="submit" disabled={phase.kind === 'sending'} className="inline-flex h-8 items-center rounded-md px-3 text-[0.8125rem] font-medium text-white disabled:opacity-60" style={{ background: 'var(--st-brand)' }}>
        {phase.kind === 'sending' ? 'Sending…' : 'Send PDF'}
      </button>
      {phase.kind === 'error' ? (
        <p id={`${id}-error`} role="alert" className="w-full text-sm text-danger-700">
          {phase.message}
        </p>
      ) : null}
    </form>
  );
}
