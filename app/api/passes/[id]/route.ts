import { route, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { idParams } from '@/lib/server/http/params';
import { passDetail } from '@/lib/server/embed/service';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('firm.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ pass: await passDetail(m, id) });
});
