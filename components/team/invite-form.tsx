'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { inviteSchema } from '@/lib/core/auth/schemas';
import { applyServerErrors } from '@/lib/client/api';
import { Button } from '@/components/ui/button';
import { Select, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import type { Invitation } from '@/components/hooks/use-team';

type In = z.input<typeof inviteSchema>;
type Out = z.output<typeof inviteSchema>;

const ROLE_OPTIONS = [
  { value: 'author', label: 'Author' },
  { value: 'checker', label: 'Checker' },
];

export function InviteForm({ onInvite }: { onInvite: (v: Out) => Promise<Invitation> }) {
  const [formMessages, setFormMessages] = useState<string[]>([]);
  const [sent, setSent] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({ resolver: zodResolver(inviteSchema), defaultValues: { email: '', role: 'author' } });

  const submit = handleSubmit(async (values) => {
    setFormMessages([]);
    setSent(null);
    try {
      const inv = await onInvite(values);
      reset({ email: '', role: values.role });
      setSent(inv.role === 'author' ? 'an author' : 'a checker');
    } catch (err) {
      setFormMessages(applyServerErrors(err, setError, ['email', 'role']));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-3">
      <FormError messages={formMessages} />
      {sent ? (
        <Banner tone="success" title="Invitation sent">
          We e-mailed a link to join as {sent}. It works once and expires in 7 days; it is listed under Pending invitations until then.
        </Banner>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,11rem)_auto] sm:items-start">
        <TextField label="E-mail" type="email" autoComplete="off" placeholder="colleague@yourfirm.com" error={errors.email?.message} {...register('email')} />
        <Select label="Role" options={ROLE_OPTIONS} error={errors.role?.message} {...register('role')} />
        <Button type="submit" pending={isSubmitting} pendingLabel="Sending…" className="sm:mt-6">
          Send invitation
        </Button>
      </div>
    </form>
  );
}
