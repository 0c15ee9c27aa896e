import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { listMembers, listPendingInvitations } from '@/db/team';
import { seatUsage } from '@/lib/team/seats';

export const GET = route(async () => {
  const m = await requireMember('team.manage');
  const [members, invitations, seats] = await Promise.all([listMembers(m.firmId), listPendingInvitations(m.firmId), seatUsage(m.firmId)]);
  return json({ members, invitations, seats });
});
