'use client';

// Inside the client's frame, in the widget's own look. Kept free of the dashboard's components so the embed
// page's JavaScript stays as small as it is (tests/bench/embed-weight.mjs).
export default function EmbedError({ error, retry }: { error: unknown; retry: () => void }) {
  const digest = error && typeof error === 'object' && 'digest' in error && typeof error.digest === 'string' ? error.digest : null;
  return (
    <section role="alert" aria-labelledby="embed-error-title" className="rounded-lg border border-ink-200 bg-white px-5 py-4 text-ink-800">
      <div className="flex items-start gap-3">
        <svg aria-hidden="true" viewBox="0 0 20 20" className="mt-0.5 h-5 w-5 flex-none text-danger-700">
          <circle cx="10" cy="10" r="8.25" fill="none" stroke="currentColor" strokeWidth="1.5" />
          <path d="M10 5.5v5.5M10 13.6v.4" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </svg>
        <div>
          <h1 id="embed-error-title" className="text-base font-semibold text-ink-900">
            This widget could not be shown
          </h1>
          <p className="mt-1 text-sm text-ink-700">
            Something went wrong while preparing it. Try again; if it keeps failing, tell the engineering firm that supplied it
            {digest ? ' and quote the reference' : ''}.
          </p>
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
        </div>
      </div>
    </section>
  );
}
