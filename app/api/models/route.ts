import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { createModelSchema } from '@/lib/models/schemas';
import { createModel, modelList } from '@/lib/models/service';

export const GET = route(async (req) => {
  const m = await requireMember('models.read');
  const archived = req.nextUrl.searchParams.get('archived');
  return json({ models: await modelList(m, { includeArchived: archived === '1' || archived === 'true' }) });
});

export const POST = route(async (req) => {
  const m = await requireMember('models.edit');
  const input = await readJson(req, createModelSchema);
  return json({ model: await createModel(m, input) }, 201);
});
