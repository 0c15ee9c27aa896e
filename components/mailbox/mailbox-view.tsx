'use client';

import { useState, type ReactNode } from 'react';
import { useMailbox, type MailMessage } from '@/components/hooks/use-mailbox';
import { Banner } from '@/components/ui/banner';
import { EmptyState } from '@/components/ui/empty-state';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { Tabs } from '@/components/ui/tabs';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { formatBytes, formatDateTime, formatRelative } from '@/components/ui/format';

const recipients = (m: MailMessage) => (Array.isArray(m.to) ? m.to.join(', ') : m.to);
const sender = (m: MailMessage) => (m.fromName && m.from ? `${m.fromName} <${m.from}>` : (m.from ?? '(no sender)'));
const sentAt = (m: MailMessage) => m.receivedAt ?? m.date;

/** Plain text with its web addresses as links (sign-in and invitation links are the point of this page). */
function LinkedText({ text }: { text: string }) {
  const parts: ReactNode[] = [];
  const re = /https?:\/\/[^\s<>"')]+/g;
  let last = 0;
  for (const m of text.matchAll(re)) {
    const i = m.index ?? 0;
    if (i > last) parts.push(text.slice(last, i));
    parts.push(
      <a key={i} href={m[0]} className="break-all text-accent-800 underline">
        {m[0]}
      </a>,
    );
    last = i + m[0].length;
  }
  if (last < text.length) parts.push(text.slice(last));
  return <pre className="text-[0.8125rem] leading-relaxed whitespace-pre-wrap break-words text-ink-800">{parts.length ? parts : '(This message has no plain-text body.)'}</pre>;
}

/** HTML bodies render in a sandbox: no scripts, no same-origin access; links open in a new tab. */
function HtmlBody({ html }: { html: string }) {
  const doc = `<!doctype html><html><head><meta charset="utf-8"><base target="_blank"><meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data: http: https:; style-src 'unsafe-inline'"></head><body>${html}</body></html>`;
  return <iframe title="HTML body of the message" sandbox="allow-popups allow-popups-to-escape-sandbox" srcDoc={doc} className="h-[28rem] w-full rounded-md border border-ink-200 bg-white" />;
}

function MessageView({ message, onBack }: { message: MailMessage; onBack: () => void }) {
  const tabs = [{ id: 'text', label: 'Text', content: <LinkedText text={message.text} /> }];
  if (message.html) tabs.push({ id: 'html', label: 'HTML', content: <HtmlBody html={message.html} /> });
  return (
    <article aria-labelledby="message-subject" className="rounded-lg border border-ink-200 bg-white">
      <header className="border-b border-ink-100 px-4 py-3 sm:px-5">
        <Button size="sm" variant="ghost" className="-ml-2 mb-1 lg:hidden" onClick={onBack}>
          ← All messages
        </Button>
        <h2 id="message-subject" className="text-base font-semibold text-ink-900">
          {message.subject || '(no subject)'}
        </h2>
        <dl className="mt-2 grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-0.5 text-sm">
          <dt className="text-ink-600">From</dt>
          <dd className="break-all text-ink-800">{sender(message)}</dd>
          <dt className="text-ink-600">To</dt>
          <dd className="break-all text-ink-800">{recipients(message)}</dd>
          <dt className="text-ink-600">Date</dt>
          <dd className="num text-ink-800">{formatDateTime(sentAt(message))}</dd>
        </dl>
      </header>
      <div className="px-4 py-3 sm:px-5">
        <Tabs key={message.id} label="Message body" tabs={tabs} defaultTab={message.html ? 'html' : 'text'} />
        {message.attachments.length ? (
          <section aria-labelledby="attachments-heading" className="mt-4 border-t border-ink-100 pt-3">
            <h3 id="attachments-heading" className="text-sm font-semibold text-ink-900">
              Attachments
            </h3>
            <ul className="mt-2 space-y-1.5">
              {message.attachments.map((a, i) => {
                const index = a.index ?? i;
                const name = a.filename ?? `attachment-${index + 1}`;
                return (
                  <li key={index} className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
                    <a
                      href={`/api/dev/mailbox/${encodeURIComponent(message.id)}/attachments/${index}`}
                      download={name}
                      className="font-medium break-all text-accent-800 underline"
                    >
                      {name}
                    </a>
                    <span className="num text-xs text-ink-600">
                      {a.contentType}, {formatBytes(a.size)}
                    </span>
                  </li>
                );
              })}
            </ul>
          </section>
        ) : null}
      </div>
    </article>
  );
}

export function MailboxView() {
  const mailbox = useMailbox();
  const [selectedId, setSelectedId] = useState<string | null>(null);

  if (mailbox.off) {
    return (
      <Banner tone="info" title="Mailbox off">
        The development mailbox is off because a real SMTP relay is configured.
      </Banner>
    );
  }
  if (mailbox.error && !mailbox.data) return <LoadError error={mailbox.error} what="the mailbox" onRetry={() => mailbox.mutate()} />;
  if (!mailbox.data) return <Loading>Loading messages…</Loading>;
  if (!mailbox.messages.length) {
    return (
      <EmptyState title="No messages yet">
        <p>
          Sign-in links, invitations and PDF snapshots sent by this installation land here while it uses the local mail server. Ask for a sign-in link, or invite a colleague from the Team page,
          and the message appears within a few seconds.
        </p>
      </EmptyState>
    );
  }

  const selected = mailbox.messages.find((m) => m.id === selectedId) ?? null;
  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)] lg:items-start">
      <section aria-labelledby="inbox-heading" className={cx('rounded-lg border border-ink-200 bg-white', selected && 'hidden lg:block')}>
        <h2 id="inbox-heading" className="border-b border-ink-100 px-4 py-2.5 text-sm font-semibold text-ink-900">
          Messages <span className="num font-normal text-ink-600">({mailbox.messages.length})</span>
        </h2>
        <ul className="max-h-[70vh] divide-y divide-ink-100 overflow-y-auto">
          {mailbox.messages.map((m) => {
            const on = m.id === selectedId;
            return (
              <li key={m.id}>
                <button
                  type="button"
                  aria-current={on ? 'true' : undefined}
                  onClick={() => setSelectedId(m.id)}
                  className={cx('block w-full px-4 py-2.5 text-left hover:bg-ink-50', on && 'bg-accent-50 shadow-[inset_3px_0_0_#14574f]')}
                >
                  <span className="block truncate text-sm font-medium text-ink-900">{m.subject || '(no subject)'}</span>
                  <span className="mt-0.5 flex justify-between gap-3 text-xs text-ink-600">
                    <span className="truncate">To {recipients(m)}</span>
                    <span className="flex-none">
                      {m.attachments.length ? `${m.attachments.length} file${m.attachments.length === 1 ? '' : 's'} · ` : ''}
                      {formatRelative(sentAt(m))}
                    </span>
                  </span>
                </button>
              </li>
            );
          })}
        </ul>
      </section>
      {selected ? (
        <MessageView message={selected} onBack={() => setSelectedId(null)} />
      ) : (
        <p className="hidden rounded-lg border border-dashed border-ink-300 bg-white px-5 py-10 text-center text-sm text-ink-600 lg:block">Choose a message to read it.</p>
      )}
    </div>
  );
}
