import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { listClients } from '@/db/clients';
import { clientCreateSchema } from '@/lib/embed/schemas';
import { clientListView, clientView, createClient } from '@/lib/embed/service';

export const GET = route(async (req) => {
  const m = await requireMember('firm.read');
  const includeArchived = req.nextUrl.searchParams.get('archived') === '1';
  return json({ clients: (await listClients(m.firmId, { includeArchived })).map(clientListView) });
});

export const POST = route(async (req) => {
  const m = await requireMember('clients.manage');
  const input = await readJson(req, clientCreateSchema);
  return json({ client: clientView(await createClient(m, input)) }, 201);
});
