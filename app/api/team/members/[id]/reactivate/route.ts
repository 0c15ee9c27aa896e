import { route, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { reactivateMember } from '@/lib/server/team/accounts';
import { idParams } from '@/lib/server/http/params';

export const POST = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ member: await reactivateMember(m, id) });
});
