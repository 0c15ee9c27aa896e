'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { signIn } from 'next-auth/react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { PASSWORD_RULE, nameField, passwordField } from '@/lib/core/auth/schemas';
import { ApiError, applyServerErrors } from '@/lib/client/api';
import type { InvitationView } from '@/lib/core/api-types';
import { useInvitation } from '@/components/hooks/use-invitation';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import { Loading } from '@/components/ui/loading';
import { formatDateTime } from '@/components/ui/format';
import { AuthCard } from './auth-card';

const ROLE_WORDS: Record<InvitationView['role'], { label: string; does: string }> = {
  author: { label: 'Author', does: 'You will build models, save versions and publish checked versions to clients.' },
  checker: { label: 'Checker', does: 'You will review versions of models and sign them off before they are published.' },
  owner: { label: 'Owner', does: 'You will run the firm’s account: team, seats and settings.' },
};

const newAccountSchema = z.object({ name: nameField, password: passwordField });
const existingAccountSchema = z.object({ name: z.string().optional(), password: z.string().min(1, 'Enter the password of your Stochos account.') });
type Values = { name?: string; password: string };

function AcceptForm({ invitation, accept }: { invitation: InvitationView; accept: ReturnType<typeof useInvitation>['accept'] }) {
  const router = useRouter();
  const [messages, setMessages] = useState<string[]>([]);
  const [leaving, setLeaving] = useState(false);
  const [gone, setGone] = useState<string | null>(null);
  const existing = invitation.existingAccount;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(existing ? existingAccountSchema : newAccountSchema), defaultValues: { name: '', password: '' } });

  const submit = handleSubmit(async (values) => {
    setMessages([]);
    let email: string;
    try {
      ({ email } = await accept({ password: values.password, ...(existing ? {} : { name: values.name }) }));
    } catch (err) {
      if (err instanceof ApiError && err.status === 410) {
        setGone(err.message);
        return;
      }
      setMessages(applyServerErrors(err, setError, ['name', 'password']));
      return;
    }
    const res = await signIn('credentials', { email, password: values.password, redirect: false }).catch(() => null);
    if (!res || res.error) {
      setMessages([`You joined ${invitation.firmName}, but signing in straight away did not work. Sign in with your e-mail and password.`]);
      return;
    }
    setLeaving(true);
    router.replace('/app');
    router.refresh();
  });

  if (gone) return <GoneNotice message={gone} />;

  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={messages} />
      {existing ? (
        <p className="text-sm text-ink-700">
          You already have a Stochos account with this address. Enter its password to join {invitation.firmName}.
        </p>
      ) : (
        <TextField label="Your name" autoComplete="name" hint="As your colleagues will see it." error={errors.name?.message} {...register('name')} />
      )}
      <TextField
        label="Password"
        type="password"
        autoComplete={existing ? 'current-password' : 'new-password'}
        hint={existing ? 'The password of your existing Stochos account.' : `Choose one. ${PASSWORD_RULE}`}
        error={errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" className="w-full" pending={isSubmitting || leaving} pendingLabel="Joining…">
        Accept invitation
      </Button>
    </form>
  );
}

function GoneNotice({ message }: { message: string }) {
  return (
    <Banner tone="warn" title="This invitation can no longer be used">
      <p>{message}</p>
      <p className="mt-1.5">
        Invitation links work once and expire after 7 days. Ask the person who invited you to send a new invitation from their Team page. If you already joined,{' '}
        <Link href="/sign-in">sign in</Link>.
      </p>
    </Banner>
  );
}

export function InviteAcceptance({ token }: { token: string }) {
  const { data, error, accept } = useInvitation(token);

  if (error) {
    if (error instanceof ApiError && error.status === 410) {
      return (
        <AuthCard title="Invitation no longer valid">
          <GoneNotice message={error.message} />
        </AuthCard>
      );
    }
    if (error instanceof ApiError && error.status === 404) {
      return (
        <AuthCard title="We do not recognise this invitation">
          <Banner tone="warn">
            Check that you opened the whole link from the e-mail: long links sometimes break across lines. If it still does not work, ask for a new invitation.
          </Banner>
        </AuthCard>
      );
    }
    return (
      <AuthCard title="Could not load the invitation">
        <Banner tone="danger">{error instanceof Error ? error.message : 'Try again in a moment.'}</Banner>
      </AuthCard>
    );
  }
  if (!data) {
    return (
      <AuthCard title="Your invitation">
        <Loading>Reading the invitation…</Loading>
      </AuthCard>
    );
  }

  const role = ROLE_WORDS[data.role] ?? ROLE_WORDS.author;
  return (
    <AuthCard title={<>Join {data.firmName}</>} intro="You have been invited to the firm’s account on Stochos.">
      <dl className="mb-5 grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1.5 rounded-lg border border-ink-200 bg-ink-50 px-4 py-3 text-sm">
        <dt className="text-ink-600">Firm</dt>
        <dd className="font-medium text-ink-900">{data.firmName}</dd>
        <dt className="text-ink-600">Role</dt>
        <dd className="text-ink-900">
          <span className="font-medium">{role.label}</span>
          <span className="block text-ink-600">{role.does}</span>
        </dd>
        <dt className="text-ink-600">E-mail</dt>
        <dd className="font-medium break-all text-ink-900">{data.email}</dd>
        <dt className="text-ink-600">Expires</dt>
        <dd className="num text-ink-900">
          <time dateTime={data.expiresAt}>{formatDateTime(data.expiresAt)}</time>
        </dd>
      </dl>
      <AcceptForm invitation={data} accept={accept} />
    </AuthCard>
  );
}
