import { route, noContent, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { idParams } from '@/lib/server/http/params';
import { revokeKey } from '@/lib/server/firm/service';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('apikeys.manage');
  const { id } = parseParams(await ctx.params, idParams);
  await revokeKey(m, id);
  return noContent();
});
