import { route, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { idParams } from '@/lib/http/params';
import { passDetail } from '@/lib/embed/service';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('firm.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ pass: await passDetail(m, id) });
});
