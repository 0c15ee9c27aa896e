'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { PASSWORD_RULE, emailField, passwordField } from '@/lib/core/auth/schemas';
import { ApiError, api, applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import { MailboxNotice } from './mailbox-notice';

const requestSchema = z.object({ email: emailField });

/** Asks for a reset link; the answer reads the same whether or not the address has an account. */
export function ResetRequestForm({ defaultEmail = '' }: { defaultEmail?: string }) {
  const [messages, setMessages] = useState<string[]>([]);
  const [sent, setSent] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<z.input<typeof requestSchema>, unknown, z.output<typeof requestSchema>>({ resolver: zodResolver(requestSchema), defaultValues: { email: defaultEmail } });

  const submit = handleSubmit(async ({ email }) => {
    setMessages([]);
    try {
      await api.post('/api/password-reset', { email });
    } catch (err) {
      setMessages(applyServerErrors(err, setError, ['email']));
      return;
    }
    setSent(email);
  });

  if (sent) {
    return (
      <div className="space-y-4">
        <h2 className="text-base font-semibold text-ink-900">Check your mailbox</h2>
        <MailboxNotice email={sent}>
          <p>If a Stochos account uses this address, the message holds a link to choose a new password. It works once and expires after 30 minutes.</p>
          <p>
            No message after a few minutes? Look in your spam folder, check the address, or{' '}
            <button type="button" className="font-medium text-accent-800 underline" onClick={() => setSent(null)}>
              ask again
            </button>
            .
          </p>
        </MailboxNotice>
      </div>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      <TextField label="E-mail" type="email" autoComplete="email" hint="The address you sign in with." error={errors.email?.message} {...register('email')} />
      <Button type="submit" className="w-full" pending={isSubmitting} pendingLabel="Sending the link…">
        E-mail me a link
      </Button>
    </form>
  );
}

const resetSchema = z
  .object({ password: passwordField, repeat: z.string() })
  .refine((v) => v.password === v.repeat, { path: ['repeat'], message: 'The two passwords differ. Type the same one twice.' });

/** The page a reset e-mail links to: a new password, then the person is signed in and every other session ends. */
export function ResetPasswordForm({ token }: { token: string }) {
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
  } = useForm<z.infer<typeof resetSchema>>({ resolver: zodResolver(resetSchema), defaultValues: { password: '', repeat: '' } });

  const submit = handleSubmit(async ({ password }) => {
    setMessages([]);
    let result: { email: string; canSignIn: boolean };
    try {
      result = await api.post<{ email: string; canSignIn: boolean }>('/api/password-reset/confirm', { token, password });
    } catch (err) {
      if (err instanceof ApiError && (err.status === 404 || err.status === 410)) {
        setDead(err.status === 404 ? 'We do not recognise this link. Open the whole link from the e-mail, or ask for a new one.' : err.message);
        return;
      }
      setMessages(applyServerErrors(err, setError, ['password']));
      return;
    }
    const res = result.canSignIn ? await signIn('credentials', { email: result.email, password, redirect: false }).catch(() => null) : null;
    if (!res || res.error) {
      setDone(result.email);
      return;
    }
    setLeaving(true);
    router.replace('/app');
    router.refresh();
  });

  if (dead) {
    return (
      <Banner tone="warn" title="This link cannot be used" action={<Link href="/reset-password">Ask for a new link</Link>}>
        {dead}
      </Banner>
    );
  }
  if (done) {
    return (
      <Banner tone="success" title="Your new password is set" action={<Link href={`/sign-in?email=${encodeURIComponent(done)}`}>Sign in</Link>}>
        Every other session of your account was signed out. Sign in with the new password.
      </Banner>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      <TextField label="New password" type="password" autoComplete="new-password" hint={PASSWORD_RULE} error={errors.password?.message} {...register('password')} />
      <TextField label="New password again" type="password" autoComplete="new-password" error={errors.repeat?.message} {...register('repeat')} />
      <Button type="submit" className="w-full" pending={isSubmitting || leaving} pendingLabel="Setting the password…">
        Set the new password
      </Button>
      <p className="text-xs text-ink-600">Setting it signs out every other session of your account, on every device.</p>
    </form>
  );
}
