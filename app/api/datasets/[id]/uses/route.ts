import { route, json, parseParams, readJson } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { recordUse, useSchema } from '@/lib/server/datasets/service';
import { idParams } from '@/lib/server/http/params';

/** Records that a model copied this dataset (fitted law or empirical) and which hash it copied. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  return json(await recordUse(m, id, await readJson(req, useSchema)), 201);
});
