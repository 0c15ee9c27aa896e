'use client';

import { EmbedNotice } from '@/components/embed/embed-notice';

// Inside the client's frame, in the widget's own look (the refusal notice's markup, which is plain and light).
export default function EmbedError({ error, retry }: { error: unknown; retry: () => void }) {
  const digest = error && typeof error === 'object' && 'digest' in error && typeof error.digest === 'string' ? error.digest : null;
  return (
    <EmbedNotice
      tone="danger"
      title="This widget could not be shown"
      body={`Something went wrong while preparing it. Try again; if it keeps failing, tell the engineering firm that supplied it${digest ? ' and quote the reference' : ''}.`}
    >
      {digest ? (
        <p className="mt-2 text-xs text-ink-600">
          Reference <code data-testid="error-reference" className="font-mono text-ink-800">{digest}</code>
        </p>
      ) : null}
      <button
        type="button"
        onClick={() => retry()}
        className="mt-3 inline-flex h-8 items-center rounded-md border border-ink-300 bg-white px-3 text-sm font-medium text-ink-800 shadow-sm hover:border-ink-400 hover:bg-ink-50"
      >
        Try again
      </button>
    </EmbedNotice>
  );
}
