import type { ReactNode } from 'react';

/** "Check your mailbox": shown after any request that sends a link, worded the same whether or not the address is known. */
export function MailboxNotice({ email, children }: { email: string; children: ReactNode }) {
  return (
    <div className="flex gap-3" role="status">
      <svg aria-hidden="true" viewBox="0 0 40 32" className="h-8 w-10 flex-none text-accent-700">
        <rect x="2" y="3" width="36" height="26" rx="3" fill="none" stroke="currentColor" strokeWidth="2" />
        <path d="m3 5 17 13L37 5" fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" />
      </svg>
      <div className="space-y-2 text-ink-700">
        <p>
          We sent a message to <strong className="font-semibold break-all text-ink-900">{email}</strong>.
        </p>
        <div className="space-y-2 text-sm text-ink-600">{children}</div>
      </div>
    </div>
  );
}
