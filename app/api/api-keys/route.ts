import { z } from 'zod';
import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { apiKeyList, createApiKey } from '@/lib/server/firm/service';

const createSchema = z.object({ name: z.string().trim().min(1, 'Name the key after what will use it.').max(80, 'Use at most 80 characters.') });

export const GET = route(async () => {
  const m = await requireMember('apikeys.manage');
  return json({ keys: await apiKeyList(m) });
});

export const POST = route(async (req) => {
  const m = await requireMember('apikeys.manage');
  const { name } = await readJson(req, createSchema);
  return json({ key: await createApiKey(m, name) }, 201);
});
