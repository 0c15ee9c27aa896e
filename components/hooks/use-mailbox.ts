'use client';

import useSWR from 'swr';
import { ApiError, fetcher } from '@/lib/client/api';
import type { MailboxMessage as MailMessage } from '@/lib/core/api-types';

export type { MailboxAttachment as MailAttachment, MailboxMessage as MailMessage } from '@/lib/core/api-types';

export const MAILBOX_KEY = '/api/dev/mailbox';

const when = (m: MailMessage) => Date.parse(m.receivedAt ?? m.date ?? '') || 0;

/** The development mailbox, newest first; polls every few seconds and stops when the mailbox is off (404). */
export function useMailbox() {
  const swr = useSWR<{ messages: MailMessage[] } | MailMessage[]>(MAILBOX_KEY, fetcher, {
    refreshInterval: (data) => (data ? 3000 : 0),
    shouldRetryOnError: (err: unknown) => !(err instanceof ApiError && err.status === 404),
  });
  const off = swr.error instanceof ApiError && swr.error.status === 404;
  const raw = Array.isArray(swr.data) ? swr.data : (swr.data?.messages ?? []);
  const messages = [...raw].sort((a, b) => when(b) - when(a));
  return { ...swr, messages, off };
}
