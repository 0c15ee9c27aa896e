'use client';

import { useState } from 'react';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { PASSWORD_RULE, changePasswordSchema } from '@/lib/core/auth/schemas';
import { api, applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import { Card } from '@/components/ui/card';

const schema = changePasswordSchema
  .extend({ repeat: z.string() })
  .refine((v) => v.newPassword === v.repeat, { path: ['repeat'], message: 'The two new passwords differ. Type the same one twice.' });
type Values = z.infer<typeof schema>;

/** Every member's own password. A change ends every session; this one signs in again with the new password. */
export function ChangePassword({ email }: { email: string }) {
  const [messages, setMessages] = useState<string[]>([]);
  const [changed, setChanged] = useState<'signed-in' | 'signed-out' | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { currentPassword: '', newPassword: '', repeat: '' } });

  const submit = handleSubmit(async ({ currentPassword, newPassword }) => {
    setMessages([]);
    setChanged(null);
    try {
      await api.post('/api/me/password', { currentPassword, newPassword });
    } catch (err) {
      setMessages(applyServerErrors(err, setError, ['currentPassword', 'newPassword']));
      return;
    }
    // The change ended every session, this one too: sign this browser in again with the new password.
    const res = await signIn('credentials', { email, password: newPassword, redirect: false }).catch(() => null);
    setChanged(res && !res.error ? 'signed-in' : 'signed-out');
    reset();
  });

  return (
    <Card title="Your password" description={`For ${email}. Changing it signs out every other session of your account.`}>
      <form onSubmit={submit} noValidate className="max-w-md space-y-4">
        {changed === 'signed-in' ? (
          <Banner tone="success" title="Password changed">
            Every other session of your account was signed out; this one continues.
          </Banner>
        ) : null}
        {changed === 'signed-out' ? (
          <Banner tone="warn" title="Password changed">
            Every session was signed out, this one too. Sign in again with the new password.
          </Banner>
        ) : null}
        <FormError messages={messages} />
        <TextField label="Current password" type="password" autoComplete="current-password" error={errors.currentPassword?.message} {...register('currentPassword')} />
        <TextField label="New password" type="password" autoComplete="new-password" hint={PASSWORD_RULE} error={errors.newPassword?.message} {...register('newPassword')} />
        <TextField label="New password again" type="password" autoComplete="new-password" error={errors.repeat?.message} {...register('repeat')} />
        <Button type="submit" pending={isSubmitting} pendingLabel="Changing…">
          Change password
        </Button>
      </form>
    </Card>
  );
}
