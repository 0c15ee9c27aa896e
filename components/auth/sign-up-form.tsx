'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { PASSWORD_RULE, signUpSchema } from '@/lib/core/auth/schemas';
import { api, applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { MailboxNotice } from './mailbox-notice';

type In = z.input<typeof signUpSchema>;
type Out = z.output<typeof signUpSchema>;

export function SignUpForm() {
  const [messages, setMessages] = useState<string[]>([]);
  const [sent, setSent] = useState<{ email: string; firmName: string } | null>(null);
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
    setSent({ email: values.email, firmName: values.firmName });
  });

  if (sent) {
    return (
      <div className="space-y-4">
        <h2 className="text-base font-semibold text-ink-900">Check your mailbox</h2>
        <MailboxNotice email={sent.email}>
          <p>
            Open the link in it within 24 hours and enter the password you just chose: that confirms the address is yours and opens the account of {sent.firmName}. Until then,
            nothing is created.
          </p>
          <p>If this address already has a Stochos account, the message says so instead: sign in, or set a new password if you forgot it.</p>
          <p>
            No message after a few minutes? Look in your spam folder, or{' '}
            <button type="button" className="font-medium text-accent-800 underline" onClick={() => setSent(null)}>
              try again
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
      <TextField label="Firm name" autoComplete="organization" hint="Your consultancy, as clients know it." error={errors.firmName?.message} {...register('firmName')} />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
      <TextField label="E-mail" type="email" autoComplete="email" hint="Your work address. We send a link to it to confirm it is yours." error={errors.email?.message} {...register('email')} />
      <TextField label="Password" type="password" autoComplete="new-password" hint={`${PASSWORD_RULE} A short sentence is easy to remember and hard to guess.`} error={errors.password?.message} {...register('password')} />
      <Button type="submit" className="w-full" pending={isSubmitting} pendingLabel="Sending the confirmation…">
        Create account
      </Button>
      <p className="text-xs text-ink-600">
        You become the account owner: you invite authors and checkers and manage seats. The owner takes no paid seat. Already asked?{' '}
        <Link href="/sign-in" className="underline">
          Sign in
        </Link>
        .
      </p>
    </form>
  );
}
