import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { teamOverview } from '@/lib/team/accounts';

export const GET = route(async () => {
  const m = await requireMember('team.manage');
  return json(await teamOverview(m));
});
