import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { duplicateModelSchema } from '@/lib/server/models/schemas';
import { duplicateModel } from '@/lib/server/models/service';
import { idParams } from '@/lib/server/http/params';

export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  const { title } = await readJson(req, duplicateModelSchema);
  return json({ model: await duplicateModel(m, id, title) }, 201);
});
