'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { ClientListView, ClientView, PassDetailView, PassView } from '@/lib/core/embed/views';

// One hook per resource: the client list, one client with its passes, one pass with its analytics.

export const clientsKey = (includeArchived: boolean) => `/api/clients${includeArchived ? '?archived=1' : ''}`;
export const clientKey = (id: string) => `/api/clients/${encodeURIComponent(id)}`;
export const passKey = (id: string) => `/api/passes/${encodeURIComponent(id)}`;

export interface ClientBody {
  name: string;
  allowedOrigins: string[];
  allowedEmailDomains: string[];
  snapshotAnyAddress: boolean;
  note?: string;
}

export function useClients(includeArchived: boolean) {
  const swr = useSWR<{ clients: ClientListView[] }>(clientsKey(includeArchived), fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    create: async (body: ClientBody) => {
      const res = await api.post<{ client: ClientView }>('/api/clients', body);
      await mutate();
      return res.client;
    },
  };
}

export function useClient(id: string) {
  const swr = useSWR<{ client: ClientView; passes: PassView[] }>(clientKey(id), fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    update: async (patch: Partial<ClientBody> & { archived?: boolean }) => {
      const res = await api.patch<{ client: ClientView }>(clientKey(id), patch);
      await mutate();
      return res.client;
    },
    rotateKey: async () => {
      const res = await api.post<{ client: ClientView; revokedPasses: number }>(`${clientKey(id)}/rotate-key`);
      await mutate();
      return res;
    },
    grant: async (body: { widgetId: string; days: number }) => {
      const res = await api.post<{ pass: PassView }>('/api/passes', { clientId: id, ...body });
      await mutate();
      return res.pass;
    },
    renew: async (passId: string, body: { days: number; retirePrevious: boolean }) => {
      const res = await api.post<{ pass: PassView }>(`${passKey(passId)}/renew`, body);
      await mutate();
      return res.pass;
    },
    revoke: async (passId: string) => {
      const res = await api.post<{ pass: PassView }>(`${passKey(passId)}/revoke`);
      await mutate();
      return res.pass;
    },
  };
}

export function usePass(id: string) {
  const swr = useSWR<{ pass: PassDetailView }>(passKey(id), fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    renew: async (body: { days: number; retirePrevious: boolean }) => {
      await api.post(`${passKey(id)}/renew`, body);
      await mutate();
    },
    revoke: async () => {
      await api.post(`${passKey(id)}/revoke`);
      await mutate();
    },
  };
}
