'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { InvitationView } from '@/lib/core/api-types';

export const invitationKey = (token: string) => `/api/invitations/${encodeURIComponent(token)}`;

/** The invitation behind an e-mailed link (public: the token is the credential); read once, not on focus. */
export function useInvitation(token: string) {
  const swr = useSWR<InvitationView>(invitationKey(token), fetcher, { revalidateOnFocus: false, shouldRetryOnError: false });
  return {
    ...swr,
    accept: (body: { password: string; name?: string }) => api.post<{ email: string }>('/api/invitations/accept', { token, ...body }),
  };
}
