'use client';

import useSWR from 'swr';
import { ApiError, fetcher } from '@/lib/client/api';

export interface MailAttachment {
  filename: string;
  contentType: string;
  size: number;
}

export interface MailMessage {
  id: string;
  from: string;
  to: string;
  subject: string;
  date: string;
  text: string;
  html: string | null;
  attachments: MailAttachment[];
}

export const MAILBOX_KEY = '/api/dev/mailbox';

/** The development mailbox; polls every few seconds and stops polling when it is off (404). */
export function useMailbox() {
  const swr = useSWR<{ messages: MailMessage[] }>(MAILBOX_KEY, fetcher, {
    refreshInterval: (data) => (data ? 3000 : 0),
    shouldRetryOnError: (err: unknown) => !(err instanceof ApiError && err.status === 404),
  });
  const off = swr.error instanceof ApiError && swr.error.status === 404;
  const messages = [...(swr.data?.messages ?? [])].sort((a, b) => Date.parse(b.date) - Date.parse(a.date));
  return { ...swr, messages, off };
}
