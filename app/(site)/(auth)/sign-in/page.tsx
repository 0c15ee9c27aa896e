import type { Metadata } from 'next';
import { AuthCard } from '@/components/auth/auth-card';
import { SignInForms } from '@/components/auth/sign-in-forms';
import { safeNext, signInErrorText } from '@/components/auth/safe-next';
import { env } from '@/lib/server/env';

export const metadata: Metadata = { title: 'Sign in' };

type Search = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function SignInPage({ searchParams }: { searchParams: Search }) {
  const sp = await searchParams;
  // next-auth names the target `callbackUrl`; our guard names it `next`. Both are parsed against our origin.
  const next = safeNext(one(sp.next) ?? one(sp.callbackUrl), env().APP_URL);
  return (
    <AuthCard title="Sign in to Stochos" intro="For consultants, checkers and account owners of a firm on Stochos. Client viewers open widgets from their own portal and need no account.">
      <SignInForms next={next} error={signInErrorText(one(sp.error))} email={one(sp.email) ?? ''} />
    </AuthCard>
  );
}
