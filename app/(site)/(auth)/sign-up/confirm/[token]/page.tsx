import type { Metadata } from 'next';
import { AuthCard } from '@/components/auth/auth-card';
import { ConfirmSignUp } from '@/components/auth/confirm-sign-up';

export const metadata: Metadata = { title: 'Confirm your address', referrer: 'no-referrer' };

export default async function ConfirmSignUpPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <AuthCard title="Confirm your address" intro="Enter the password you chose when you signed up. Your firm’s account opens and you are signed in.">
      <ConfirmSignUp token={token} />
    </AuthCard>
  );
}
