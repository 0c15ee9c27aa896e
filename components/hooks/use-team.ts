'use client';

import useSWR from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { Invitation, InvitedRole, Role, Team, TeamMember } from '@/lib/core/api-types';

export type { Invitation, SeatUsage, Team, TeamMember } from '@/lib/core/api-types';

export const TEAM_KEY = '/api/team';

/** The firm's members and pending invitations, with the owner's actions; each action revalidates the list. */
export function useTeam() {
  const swr = useSWR<Team>(TEAM_KEY, fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    invite: async (body: { email: string; role: InvitedRole }) => {
      const res = await api.post<{ invitation: Invitation }>('/api/team/invitations', body);
      await mutate();
      return res.invitation;
    },
    revokeInvitation: async (id: string) => {
      await api.delete(`/api/team/invitations/${encodeURIComponent(id)}`);
      await mutate();
    },
    changeRole: async (id: string, role: Role) => {
      const res = await api.patch<{ member: TeamMember }>(`/api/team/members/${encodeURIComponent(id)}`, { role });
      await mutate();
      return res.member;
    },
    remove: async (id: string) => {
      await api.delete(`/api/team/members/${encodeURIComponent(id)}`);
      await mutate();
    },
    reactivate: async (id: string) => {
      const res = await api.post<{ member: TeamMember }>(`/api/team/members/${encodeURIComponent(id)}/reactivate`);
      await mutate();
      return res.member;
    },
  };
}
