import { route, json, parseParams, noContent } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { datasetDetail, deleteDataset } from '@/lib/server/datasets/service';
import { idParams } from '@/lib/server/http/params';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json(await datasetDetail(m, id));
});

/** `?confirm=1` deletes a dataset that models use; without it the answer is 409 naming them. */
export const DELETE = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  await deleteDataset(m, id, req.nextUrl.searchParams.get('confirm') === '1');
  return noContent();
});
