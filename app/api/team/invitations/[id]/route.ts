import { route, noContent, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { cancelInvitation } from '@/lib/team/accounts';
import { idParams } from '@/lib/http/params';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  await cancelInvitation(m, id);
  return noContent();
});
