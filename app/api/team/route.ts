import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { teamOverview } from '@/lib/server/team/accounts';

export const GET = route(async () => {
  const m = await requireMember('team.manage');
  return json(await teamOverview(m));
});
