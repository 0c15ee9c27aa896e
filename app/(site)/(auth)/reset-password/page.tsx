import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { ResetRequestForm } from '@/components/auth/password-reset-forms';

export const metadata: Metadata = { title: 'Forgot your password?' };

export default async function ResetRequestPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const email = typeof sp.email === 'string' && sp.email.length <= 254 ? sp.email : '';
  return (
    <AuthCard
      title="Forgot your password?"
      intro="We e-mail you a link to choose a new one. It works once and expires after 30 minutes."
      footer={
        <>
          Remembered it?{' '}
          <Link href="/sign-in" className="font-medium text-accent-800 underline">
            Sign in
          </Link>
        </>
      }
    >
      <ResetRequestForm defaultEmail={email} />
    </AuthCard>
  );
}
