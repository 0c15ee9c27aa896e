import { z } from 'zod';
import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { validationError } from '@/lib/server/http/errors';
import { passCreateSchema } from '@/lib/core/embed/schemas';
import { createPass, passList, passView } from '@/lib/server/embed/service';

const filters = z.object({ clientId: z.uuid('clientId is not a valid id.').optional(), widgetId: z.uuid('widgetId is not a valid id.').optional() });

export const GET = route(async (req) => {
  const m = await requireMember('firm.read');
  const parsed = filters.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!parsed.success) throw validationError(parsed.error);
  return json({ passes: await passList(m, parsed.data) });
});

export const POST = route(async (req) => {
  const m = await requireMember('clients.manage');
  const input = await readJson(req, passCreateSchema);
  return json({ pass: await passView(await createPass(m, input)) }, 201);
});
