import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { idParams } from '@/lib/server/http/params';
import { clientPatchSchema } from '@/lib/core/embed/schemas';
import { clientDetail, clientView, editClient } from '@/lib/server/embed/service';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('firm.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json(await clientDetail(m, id));
});

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('clients.manage');
  const { id } = parseParams(await ctx.params, idParams);
  const patch = await readJson(req, clientPatchSchema);
  return json({ client: clientView(await editClient(m, id, patch)) });
});
