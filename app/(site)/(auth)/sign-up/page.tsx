import type { Metadata } from 'next';
import Link from 'next/link';
import { AuthCard } from '@/components/auth/auth-card';
import { SignUpForm } from '@/components/auth/sign-up-form';

export const metadata: Metadata = { title: 'Create your firm’s account' };

export default function SignUpPage() {
  return (
    <AuthCard
      title="Create your firm’s account"
      intro="One account per consultancy. Your colleagues join by invitation."
      footer={
        <>
          Already on Stochos?{' '}
          <Link href="/sign-in" className="font-medium text-accent-800 underline">
            Sign in
          </Link>
        </>
      }
    >
      <SignUpForm />
    </AuthCard>
  );
}
