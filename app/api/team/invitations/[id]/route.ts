import { route, noContent, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { cancelInvitation } from '@/lib/server/team/accounts';
import { idParams } from '@/lib/server/http/params';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  await cancelInvitation(m, id);
  return noContent();
});
