'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { ApiKey } from '@/lib/core/api-types';

export type { ApiKey } from '@/lib/core/api-types';

/** The firm's API keys for the simulate API (owner only). */
export function useApiKeys() {
  const swr = useSWR<{ keys: ApiKey[] }>('/api/api-keys', fetcher);
  return {
    ...swr,
    create: async (name: string) => {
      const res = await api.post<{ key: ApiKey & { secret: string } }>('/api/api-keys', { name });
      await swr.mutate();
      return res.key;
    },
    revoke: async (id: string) => {
      await api.delete(`/api/api-keys/${encodeURIComponent(id)}`);
      await swr.mutate();
    },
  };
}
