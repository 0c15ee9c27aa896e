import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { createModelSchema } from '@/lib/server/models/schemas';
import { createModel, modelList } from '@/lib/server/models/service';

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
