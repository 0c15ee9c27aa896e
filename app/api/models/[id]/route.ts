import { z } from 'zod';
import { route, readJson, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { patchModelSchema } from '@/lib/models/schemas';
import { modelDetail, setArchived } from '@/lib/models/service';

const params = z.object({ id: z.uuid() });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, params);
  return json(await modelDetail(m, id));
});

/** Archive or restore. */
export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, params);
  const { archived } = await readJson(req, patchModelSchema);
  return json({ model: await setArchived(m, id, archived) });
});
