import { z } from 'zod';
import { route, noContent, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { cancelInvitation } from '@/lib/team/accounts';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, z.object({ id: z.uuid() }));
  await cancelInvitation(m, id);
  return noContent();
});
