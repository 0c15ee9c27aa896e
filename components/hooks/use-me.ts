'use client';

import useSWR from 'swr';
import { fetcher } from '@/lib/client/api';
import type { Me } from '@/lib/core/api-types';

export type { Me, Role } from '@/lib/core/api-types';


export const ME_KEY = '/api/me';

export function useMe() {
  return useSWR<Me>(ME_KEY, fetcher);
}
