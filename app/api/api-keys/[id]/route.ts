import { route, noContent, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { idParams } from '@/lib/http/params';
import { revokeKey } from '@/lib/firm/service';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('apikeys.manage');
  const { id } = parseParams(await ctx.params, idParams);
  await revokeKey(m, id);
  return noContent();
});
