import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { clientCreateSchema } from '@/lib/core/embed/schemas';
import { clientList, clientView, createClient } from '@/lib/server/embed/service';

export const GET = route(async (req) => {
  const m = await requireMember('firm.read');
  const includeArchived = req.nextUrl.searchParams.get('archived') === '1';
  return json({ clients: await clientList(m, { includeArchived }) });
});

export const POST = route(async (req) => {
  const m = await requireMember('clients.manage');
  const input = await readJson(req, clientCreateSchema);
  return json({ client: clientView(await createClient(m, input)) }, 201);
});
