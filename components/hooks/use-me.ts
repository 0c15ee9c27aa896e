'use client';

import useSWR from 'swr';
import { fetcher } from '@/lib/client/api';

export type Role = 'owner' | 'author' | 'checker';

export interface Me {
  user: { id: string; name: string; email: string };
  firm: { id: string; name: string };
  role: Role;
  permissions: string[];
}

export const ME_KEY = '/api/me';

export function useMe() {
  return useSWR<Me>(ME_KEY, fetcher);
}
