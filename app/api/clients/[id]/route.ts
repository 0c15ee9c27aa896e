import { z } from 'zod';
import { route, readJson, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { notFound } from '@/lib/http/errors';
import { getClient } from '@/db/clients';
import { listPasses } from '@/db/passes';
import { clientPatchSchema } from '@/lib/embed/schemas';
import { clientView, editClient, passView } from '@/lib/embed/service';

const params = z.object({ id: z.uuid() });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('firm.read');
  const { id } = parseParams(await ctx.params, params);
  const client = await getClient(m.firmId, id);
  if (!client) throw notFound('That client');
  const passes = await Promise.all((await listPasses(m.firmId, { clientId: id })).map(passView));
  return json({ client: clientView(client), passes });
});

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('clients.manage');
  const { id } = parseParams(await ctx.params, params);
  const patch = await readJson(req, clientPatchSchema);
  return json({ client: clientView(await editClient(m, id, patch)) });
});
