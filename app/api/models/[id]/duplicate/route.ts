import { route, readJson, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { duplicateModelSchema } from '@/lib/models/schemas';
import { duplicateModel } from '@/lib/models/service';
import { idParams } from '@/lib/http/params';

export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  const { title } = await readJson(req, duplicateModelSchema);
  return json({ model: await duplicateModel(m, id, title) }, 201);
});
