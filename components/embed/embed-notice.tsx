import type { ReactNode } from 'react';

// A refusal or a failure in the frame: what happened and what to do, with no data behind it. Plain markup only,
// since the embed's error boundary uses it too (tests/bench/embed-weight.mjs).
export function EmbedNotice({ title, body, firmName, tone = 'warn', children }: { title: string; body: string; firmName?: string | null; tone?: 'warn' | 'danger'; children?: ReactNode }) {
  return (
    <section role="alert" aria-labelledby="embed-notice-title" className="rounded-lg border border-ink-200 bg-white px-5 py-4 text-ink-800">
      <div className="flex items-start gap-3">
        <svg aria-hidden="true" viewBox="0 0 20 20" className={`mt-0.5 h-5 w-5 flex-none ${tone === 'danger' ? 'text-danger-700' : 'text-warn-600'}`}>
          <circle cx="10" cy="10" r="8.25" fill="none" stroke="currentColor" strokeWidth="1.5" />
          <path d="M10 5.5v5.5M10 13.6v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        <div>
          <h1 id="embed-notice-title" className="text-base font-semibold text-ink-900">
            {title}
          </h1>
          <p className="mt-1 text-sm text-ink-700">{body}</p>
          {firmName ? <p className="mt-2 text-xs text-ink-600">Widget supplied by {firmName} through Stochos.</p> : null}
          {children}
        </div>
      </div>
    </section>
  );
}
