'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { ApiError, api, applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';

const schema = z.object({ password: z.string().min(1, 'Enter the password you chose when signing up.') });

/** The page the sign-up e-mail links to: the password chosen at sign-up, then the account opens and its owner is signed in. */
export function ConfirmSignUp({ token }: { token: string }) {
  const router = useRouter();
  const [messages, setMessages] = useState<string[]>([]);
  const [dead, setDead] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [leaving, setLeaving] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { password: '' } });

  const submit = handleSubmit(async ({ password }) => {
    setMessages([]);
    let email: string;
    try {
      ({ email } = await api.post<{ email: string }>('/api/sign-up/confirm', { token, password }));
    } catch (err) {
      if (err instanceof ApiError && (err.status === 404 || err.status === 410 || err.status === 409)) {
        setDead(err.status === 404 ? 'We do not recognise this link. It may have been used already (then sign in), or it was cut short: open the whole link from the e-mail.' : err.message);
        return;
      }
      setMessages(applyServerErrors(err, setError, ['password']));
      return;
    }
    const res = await signIn('credentials', { email, password, redirect: false }).catch(() => null);
    if (!res || res.error) {
      setDone(email);
      return;
    }
    setLeaving(true);
    router.replace('/app');
    router.refresh();
  });

  if (dead) {
    return (
      <Banner tone="warn" title="This link cannot be used" action={<Link href="/sign-in">Sign in</Link>}>
        <p>{dead}</p>
        <p className="mt-1.5">
          To start over, <Link href="/sign-up">sign up again</Link>.
        </p>
      </Banner>
    );
  }
  if (done) {
    return (
      <Banner tone="success" title="Your address is confirmed and the account is open" action={<Link href={`/sign-in?email=${encodeURIComponent(done)}`}>Sign in</Link>}>
        Signing in straight away did not work. Sign in with your e-mail and password.
      </Banner>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      <TextField label="Password" type="password" autoComplete="current-password" hint="The password you chose when you signed up." error={errors.password?.message} {...register('password')} />
      <Button type="submit" className="w-full" pending={isSubmitting || leaving} pendingLabel="Opening the account…">
        Confirm and open the account
      </Button>
    </form>
  );
}
