'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { emailField } from '@/lib/core/auth/schemas';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import { SIGN_IN_ERRORS } from './safe-next';

const passwordSchema = z.object({ email: emailField, password: z.string().min(1, 'Enter your password.') });
const linkSchema = z.object({ email: emailField });

function PasswordForm({ next, defaultEmail }: { next: string; defaultEmail: string }) {
  const router = useRouter();
  const [messages, setMessages] = useState<string[]>([]);
  const [leaving, setLeaving] = useState(false);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof passwordSchema>, unknown, z.output<typeof passwordSchema>>({
    resolver: zodResolver(passwordSchema),
    defaultValues: { email: defaultEmail, password: '' },
  });

  const submit = handleSubmit(async ({ email, password }) => {
    setMessages([]);
    let res: Awaited<ReturnType<typeof signIn>>;
    try {
      res = await signIn('credentials', { email, password, redirect: false });
    } catch {
      setMessages(['Could not reach Stochos. Check your connection and try again.']);
      return;
    }
    if (!res || res.error) {
      // CredentialsSignin is deliberately vague; any other error string is already a sentence (e.g. the rate limit).
      setMessages([!res?.error ? SIGN_IN_ERRORS.Default : (SIGN_IN_ERRORS[res.error] ?? res.error)]);
      return;
    }
    setLeaving(true);
    router.replace(next);
    router.refresh();
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      <TextField label="E-mail" type="email" autoComplete="username" error={errors.email?.message} {...register('email')} />
      <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register('password')} />
      <p className="-mt-2 text-right text-sm">
        <Link href="/reset-password" className="font-medium text-accent-800 underline">
          Forgot your password?
        </Link>
      </p>
      <Button type="submit" className="w-full" pending={isSubmitting || leaving} pendingLabel="Signing in…">
        Sign in
      </Button>
    </form>
  );
}

function LinkForm({ next, defaultEmail }: { next: string; defaultEmail: string }) {
  const router = useRouter();
  const [messages, setMessages] = useState<string[]>([]);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof linkSchema>, unknown, z.output<typeof linkSchema>>({ resolver: zodResolver(linkSchema), defaultValues: { email: defaultEmail } });

  const submit = handleSubmit(async ({ email }) => {
    setMessages([]);
    try {
      const res = await signIn('email', { email, redirect: false, callbackUrl: next });
      if (!res || res.error) {
        setMessages([SIGN_IN_ERRORS[res?.error ?? ''] ?? res?.error ?? SIGN_IN_ERRORS.EmailSignin]);
        return;
      }
      router.push(`/sign-in/check-email?email=${encodeURIComponent(email)}`);
    } catch {
      setMessages(['Could not reach Stochos. Check your connection and try again.']);
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-3">
      <h2 className="text-sm font-semibold text-ink-900">Sign in with a link instead</h2>
      <p className="text-sm text-ink-600">We e-mail you a link that signs you in once. It expires after 15 minutes.</p>
      <FormError messages={messages} />
      <TextField label="E-mail address for the link" type="email" autoComplete="email" error={errors.email?.message} {...register('email')} />
      <Button type="submit" variant="secondary" className="w-full" pending={isSubmitting} pendingLabel="Sending the link…">
        E-mail me a sign-in link
      </Button>
    </form>
  );
}

export function SignInForms({ next, error, email = '' }: { next: string; error: string | null; email?: string }) {
  return (
    <div className="space-y-6">
      {error ? (
        <Banner tone="warn" title="You are not signed in">
          {error}
        </Banner>
      ) : null}
      <PasswordForm next={next} defaultEmail={email} />
      <div className="flex items-center gap-3 text-xs font-medium tracking-wide text-ink-500 uppercase" aria-hidden="true">
        <span className="h-px flex-1 bg-ink-200" />
        or
        <span className="h-px flex-1 bg-ink-200" />
      </div>
      <LinkForm next={next} defaultEmail={email} />
      <p className="text-sm text-ink-600">
        New to Stochos?{' '}
        <Link href="/sign-up" className="font-medium text-accent-800 underline">
          Create your firm’s account
        </Link>
      </p>
    </div>
  );
}
