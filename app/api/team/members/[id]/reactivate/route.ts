import { route, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { reactivateMember } from '@/lib/team/accounts';
import { idParams } from '@/lib/http/params';

export const POST = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ member: await reactivateMember(m, id) });
});
