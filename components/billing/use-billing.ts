'use client';

import { useEffect, useRef, useState } from 'react';
import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { BillingSummary, SeatPreview } from '@/lib/core/api-types';

export type { BillingSummary, SeatPreview };

export const BILLING_KEY = '/api/billing';

export interface Awaiting {
  /** True once the webhook's effect shows in the summary. */
  until: (s: BillingSummary) => boolean;
  /** Shown when it does. */
  done: string;
  /** Shown if it has not after the deadline. */
  late: string;
  deadline: number;
}

/**
 * The owner's billing summary. Changes go to Stripe; the record follows by webhook, so after an action the
 * hook polls until the expected state appears (or says that confirmation is still on its way).
 */
export function useBilling() {
  const [awaiting, setAwaiting] = useState<Awaiting | null>(null);
  const [settled, setSettled] = useState<{ tone: 'success' | 'info'; text: string } | null>(null);
  const pollUntil = useRef(0);
  const swr = useSWR<BillingSummary>(BILLING_KEY, fetcher, {
    refreshInterval: () => (awaiting || Date.now() < pollUntil.current ? 1000 : 0),
    onSuccess: (d) => {
      if (awaiting && awaiting.until(d)) {
        setSettled({ tone: 'success', text: awaiting.done });
        setAwaiting(null);
      }
    },
  });

  useEffect(() => {
    if (!awaiting) return;
    const t = setTimeout(() => {
      setSettled({ tone: 'info', text: awaiting.late });
      setAwaiting(null);
    }, Math.max(0, awaiting.deadline - Date.now()));
    return () => clearTimeout(t);
  }, [awaiting]);

  const wait = (a: Omit<Awaiting, 'deadline'>, seconds = 30) => {
    setSettled(null);
    setAwaiting({ ...a, deadline: Date.now() + seconds * 1000 });
  };

  return {
    ...swr,
    awaiting,
    settled,
    clearSettled: () => setSettled(null),
    /** Polls for a while without expecting anything in particular (back from the portal, where anything may change). */
    refreshFor: (seconds: number) => {
      pollUntil.current = Date.now() + seconds * 1000;
      void swr.mutate();
    },
    wait,
    checkout: (seats: number) => api.post<{ url: string }>('/api/billing/checkout', { seats }),
    portal: () => api.post<{ url: string }>('/api/billing/portal', {}),
    preview: (seats: number) => api.post<{ preview: SeatPreview }>('/api/billing/seats/preview', { seats }).then((r) => r.preview),
    changeSeats: (body: { seats: number; prorationDate?: number; quote?: string }) => api.post<{ requestedSeats: number }>('/api/billing/seats', body),
    cancel: () => api.post<{ periodEnd: string | null }>('/api/billing/cancel', {}),
    resume: () => api.post<{ periodEnd: string | null }>('/api/billing/resume', {}),
  };
}
