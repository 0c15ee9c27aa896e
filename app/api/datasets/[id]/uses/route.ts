import { z } from 'zod';
import { route, json, parseParams, readJson } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { recordUse, useSchema } from '@/lib/datasets/service';

const params = z.object({ id: z.uuid() });

/** Records that a model copied this dataset (fitted law or empirical) and which hash it copied. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, params);
  return json(await recordUse(m, id, await readJson(req, useSchema)), 201);
});
