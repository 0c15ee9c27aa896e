'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { NotificationKind } from '@/lib/notifications/kinds';

export type NotificationPrefs = Record<NotificationKind, boolean>;

export const NOTIFICATION_PREFS_KEY = '/api/me/notifications';

export function useNotificationPrefs() {
  const swr = useSWR<{ prefs: NotificationPrefs }>(NOTIFICATION_PREFS_KEY, fetcher);
  return {
    ...swr,
    save: async (patch: Partial<NotificationPrefs>) => {
      const next = await api.put<{ prefs: NotificationPrefs }>(NOTIFICATION_PREFS_KEY, patch);
      await swr.mutate(next, { revalidate: false });
      return next;
    },
  };
}

export interface WaitingVersion {
  modelId: string;
  modelTitle: string;
  number: number;
  authorName: string | null;
  note: string | null;
  createdAt: string;
}

/** Versions waiting for the signed-in checker; refreshed every minute and whenever the window regains focus. */
export function useWaitingChecks(enabled: boolean) {
  return useSWR<{ count: number; versions: WaitingVersion[] }>(enabled ? '/api/reviews/waiting' : null, fetcher, { refreshInterval: 60_000 });
}
