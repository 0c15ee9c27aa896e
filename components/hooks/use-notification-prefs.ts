'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { NotificationPrefs, WaitingVersion } from '@/lib/core/api-types';

export type { NotificationPrefs, WaitingVersion } from '@/lib/core/api-types';

export const NOTIFICATION_PREFS_KEY = '/api/me/notifications';

export function useNotificationPrefs() {
  const swr = useSWR<{ prefs: NotificationPrefs }>(NOTIFICATION_PREFS_KEY, fetcher);
  return {
    ...swr,
    /** Shows the change at once and puts it back if the server refuses it. */
    save: async (patch: Partial<NotificationPrefs>) =>
      swr.mutate(api.put<{ prefs: NotificationPrefs }>(NOTIFICATION_PREFS_KEY, patch), {
        optimisticData: (cur) => ({ prefs: { ...(cur?.prefs as NotificationPrefs), ...patch } }),
        rollbackOnError: true,
        populateCache: true,
        revalidate: false,
      }),
  };
}

/** Versions waiting for the signed-in checker; refreshed every minute and whenever the window regains focus. */
export function useWaitingChecks(enabled: boolean) {
  return useSWR<{ count: number; versions: WaitingVersion[] }>(enabled ? '/api/reviews/waiting' : null, fetcher, { refreshInterval: 60_000 });
}
