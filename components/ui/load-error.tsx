'use client';

import Link from 'next/link';
import { ApiError, errorMessage } from '@/lib/client/api';
import { Banner } from './banner';
import { Button } from './button';

/** What to show when a list or record fails to load: what happened and what to do. */
export function LoadError({ error, what, onRetry }: { error: unknown; what: string; onRetry?: () => void }) {
  if (error instanceof ApiError && error.status === 401) {
    return (
      <Banner tone="warn" title="Your session has ended">
        Sign in again to see {what}. <Link href={`/sign-in?next=${encodeURIComponent(typeof window === 'undefined' ? '/app' : window.location.pathname)}`}>Sign in</Link>
      </Banner>
    );
  }
  if (error instanceof ApiError && error.status === 403) {
    return (
      <Banner tone="warn" title={`You cannot see ${what}`}>
        {error.message} Ask your firm’s account owner if you need access.
      </Banner>
    );
  }
  return (
    <Banner
      tone="danger"
      title={`Could not load ${what}`}
      action={
        onRetry ? (
          <Button size="sm" variant="secondary" onClick={onRetry}>
            Try again
          </Button>
        ) : null
      }
    >
      {errorMessage(error)}
    </Banner>
  );
}
