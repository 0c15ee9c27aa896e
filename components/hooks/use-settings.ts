'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { FirmSettings, LogoSaved } from '@/lib/core/api-types';

export type { FirmSettings, PaperSize, Units } from '@/lib/core/api-types';

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

/** The firm's logo for widgets, embeds and PDFs (owner only): multipart `file`; removing answers 404 when there is none. */
export function saveLogo(file: File): Promise<LogoSaved> {
  const form = new FormData();
  form.set('file', file);
  return api.put<LogoSaved>('/api/branding/logo', form);
}

export const removeLogo = (): Promise<void> => api.delete('/api/branding/logo');
