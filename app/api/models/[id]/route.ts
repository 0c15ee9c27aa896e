import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { patchModelSchema } from '@/lib/server/models/schemas';
import { modelDetail, setArchived } from '@/lib/server/models/service';
import { idParams } from '@/lib/server/http/params';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json(await modelDetail(m, id));
});

/** Archive or restore. */
export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  const { archived } = await readJson(req, patchModelSchema);
  return json({ model: await setArchived(m, id, archived) });
});
