import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';

export const metadata: Metadata = { title: 'Check your e-mail' };

export default async function CheckEmailPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const email = typeof sp.email === 'string' && sp.email.length <= 254 ? sp.email : null;
  return (
    <AuthCard
      title="Check your e-mail"
      footer={
        <>
          No message after a few minutes? Look in your spam folder, or{' '}
          <Link href={email ? `/sign-in?email=${encodeURIComponent(email)}` : '/sign-in'} className="font-medium text-accent-800 underline">
            ask for a new link
          </Link>
          .
        </>
      }
    >
      <div className="flex gap-3">
        <svg aria-hidden="true" viewBox="0 0 40 32" className="h-8 w-10 flex-none text-accent-700">
          <rect x="2" y="3" width="36" height="26" rx="3" fill="none" stroke="currentColor" strokeWidth="2" />
          <path d="m3 5 17 13L37 5" fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" />
        </svg>
        <div className="space-y-2 text-ink-700">
          <p>
            If an active Stochos account uses {email ? <strong className="font-semibold break-all text-ink-900">{email}</strong> : 'that address'}, a sign-in link is on its way.
          </p>
          <p className="text-sm text-ink-600">The link works once and expires after 15 minutes. Open it in this browser to land in your dashboard.</p>
        </div>
      </div>
    </AuthCard>
  );
}
