'use client';

import { useState } from 'react';
import { signOut } from 'next-auth/react';
import { cx } from '@/components/ui/cx';

/** Ends the session and returns to the landing page. */
export function SignOutButton({ className }: { className?: string }) {
  const [pending, setPending] = useState(false);
  return (
    <button
      type="button"
      disabled={pending}
      aria-busy={pending || undefined}
      onClick={async () => {
        setPending(true);
        await signOut({ callbackUrl: '/' });
      }}
      className={cx('inline-flex h-8 items-center gap-1.5 rounded-md px-2.5 text-sm font-medium', className)}
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4">
        <path d="M6 2.5H3.5a1 1 0 0 0-1 1v9a1 1 0 0 0 1 1H6M10.5 11 13.5 8l-3-3M13.3 8H6" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {pending ? 'Signing out…' : 'Sign out'}
    </button>
  );
}
