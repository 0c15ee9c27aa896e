'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { PASSWORD_RULE, signUpSchema } from '@/lib/auth/schemas';
import { api, applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';

type In = z.input<typeof signUpSchema>;
type Out = z.output<typeof signUpSchema>;

export function SignUpForm() {
  const router = useRouter();
  const [messages, setMessages] = useState<string[]>([]);
  const [createdButNotSignedIn, setCreatedButNotSignedIn] = useState<string | null>(null);
  const [leaving, setLeaving] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({ resolver: zodResolver(signUpSchema), defaultValues: { firmName: '', name: '', email: '', password: '' } });

  const submit = handleSubmit(async (values) => {
    setMessages([]);
    try {
      await api.post<{ email: string }>('/api/sign-up', values);
    } catch (err) {
      setMessages(applyServerErrors(err, setError, ['firmName', 'name', 'email', 'password']));
      return;
    }
    const res = await signIn('credentials', { email: values.email, password: values.password, redirect: false }).catch(() => null);
    if (!res || res.error) {
      setCreatedButNotSignedIn(res?.error && res.error !== 'CredentialsSignin' ? res.error : 'Signing in straight away did not work.');
      return;
    }
    setLeaving(true);
    router.replace('/app');
    router.refresh();
  });

  if (createdButNotSignedIn) {
    return (
      <Banner tone="warn" title="Your firm’s account is ready" action={<Link href="/sign-in">Sign in</Link>}>
        {createdButNotSignedIn} Sign in with the e-mail and password you just chose.
      </Banner>
    );
  }

  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      <TextField label="Firm name" autoComplete="organization" hint="Your consultancy, as clients know it." error={errors.firmName?.message} {...register('firmName')} />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
      <TextField label="E-mail" type="email" autoComplete="email" hint="Your work address. You sign in with it." error={errors.email?.message} {...register('email')} />
      <TextField label="Password" type="password" autoComplete="new-password" hint={`${PASSWORD_RULE} A short sentence is easy to remember and hard to guess.`} error={errors.password?.message} {...register('password')} />
      <Button type="submit" className="w-full" pending={isSubmitting || leaving} pendingLabel="Creating the account…">
        Create account
      </Button>
      <p className="text-xs text-ink-600">You become the account owner: you invite authors and checkers and manage seats. The owner takes no paid seat.</p>
    </form>
  );
}
