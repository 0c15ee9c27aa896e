import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { datasetList, uploadDataset } from '@/lib/server/datasets/service';

export const GET = route(async () => {
  const m = await requireMember('models.read');
  return json({ datasets: await datasetList(m) });
});

/** Multipart: `file` (CSV) or `text` (a pasted column), with `name`, `unit`, `column` (index) and `drop` (row numbers). */
export const POST = route(async (req) => {
  const m = await requireMember('models.edit');
  return json(await uploadDataset(m, req), 201);
});
