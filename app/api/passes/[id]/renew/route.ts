import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { passRenewSchema } from '@/lib/core/embed/schemas';
import { passView, renewPass } from '@/lib/server/embed/service';
import { idParams } from '@/lib/server/http/params';

export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('clients.manage');
  const { id } = parseParams(await ctx.params, idParams);
  const input = await readJson(req, passRenewSchema);
  return json({ pass: await passView(await renewPass(m, id, input)) });
});
