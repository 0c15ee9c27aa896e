'use client';

import { useEffect, useRef } from 'react';
import { buttonClasses } from '@/components/ui/button-classes';
import { errorReference } from './error-reference';

export interface ErrorScreenProps {
  error: unknown;
  /** Next's `retry`: fetches and renders the segment again. */
  retry: () => void;
  /** Where to go instead. */
  back: { href: string; label: string };
}

/**
 * What a route segment shows when it fails: what happened, what to do, and the reference to quote. Plain markup
 * and a plain link (no next/link, no copy button): the root error boundary uses it, and that boundary is part of
 * the embed page too, whose weight is measured (tests/bench/embed-weight.mjs).
 */
export function ErrorScreen({ error, retry, back }: ErrorScreenProps) {
  const reference = errorReference(error);
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    // The page underneath is gone: move focus to the explanation so keyboard and screen reader users hear it.
    heading.current?.focus();
    // A browser-side error has no server log line; keep it in the console for whoever investigates.
    if (!reference) console.error(error);
  }, [error, reference]);

  return (
    <section aria-labelledby="error-screen-title" className="mx-auto max-w-2xl rounded-lg border border-l-4 border-danger-600/30 border-l-danger-700 bg-white px-5 py-6 shadow-sm sm:px-7">
      <h1 id="error-screen-title" ref={heading} tabIndex={-1} className="text-xl font-semibold tracking-tight text-ink-900 outline-none">
        This page could not be shown
      </h1>
      <p className="mt-2 max-w-prose text-[0.9375rem] text-ink-700">
        {reference
          ? 'Something went wrong on our side while preparing it. Trying again often works; if it keeps failing, quote the reference below to your firm’s account owner or to Stochos support, who can find it in the server log.'
          : 'Something went wrong in your browser while showing it. Trying again often works; reloading the page starts it afresh.'}
      </p>
      {reference ? (
        <p className="mt-4 text-sm text-ink-700">
          Reference{' '}
          <code data-testid="error-reference" className="rounded bg-ink-100 px-1.5 py-0.5 font-mono text-[0.8125rem] text-ink-900 select-all">
            {reference}
          </code>
        </p>
      ) : null}
      <div className="mt-6 flex flex-wrap gap-2">
        <button type="button" onClick={() => retry()} className={buttonClasses('primary')}>
          Try again
        </button>
        <a href={back.href} className={buttonClasses('secondary')}>
          {back.label}
        </a>
      </div>
    </section>
  );
}
