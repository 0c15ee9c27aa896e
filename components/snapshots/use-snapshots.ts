'use client';

import useSWR from 'swr';
import { fetcher } from '@/lib/client/api';
import type { SnapshotListRow } from '@/lib/core/api-types';

// One hook per resource: the firm's snapshot requests, optionally for one client.

export const snapshotsKey = (clientId: string | null) => `/api/snapshots${clientId ? `?clientId=${encodeURIComponent(clientId)}` : ''}`;

export function useSnapshots(clientId: string | null) {
  // Jobs move from queued to sent within seconds: poll while any row is still on its way.
  return useSWR<{ snapshots: SnapshotListRow[] }>(snapshotsKey(clientId), fetcher, {
    refreshInterval: (data) => (data?.snapshots.some((s) => s.state === 'queued' || s.state === 'rendering' || s.state === 'sending') ? 4000 : 0),
  });
}
