'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';

export type Units = 'mm' | 'in' | 'um';
export type PaperSize = 'A4' | 'Letter';

export interface FirmSettings {
  name: string;
  unitsDefault: Units;
  currencyDefault: string;
  brandColor: string;
  requireCheck: boolean;
  paperSize: PaperSize;
}

export const SETTINGS_KEY = '/api/settings';

export function useSettings() {
  const swr = useSWR<FirmSettings>(SETTINGS_KEY, fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    /** Saves a partial change (owner only) and puts the server's answer in the cache. */
    save: async (patch: Partial<FirmSettings>) => {
      const next = await api.patch<FirmSettings>(SETTINGS_KEY, patch);
      await mutate(next, { revalidate: true });
      return next;
    },
  };
}
