import { route, json, parseParams, readJson } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { recordUse, useSchema } from '@/lib/datasets/service';
import { idParams } from '@/lib/http/params';

/** Records that a model copied this dataset (fitted law or empirical) and which hash it copied. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  return json(await recordUse(m, id, await readJson(req, useSchema)), 201);
});
