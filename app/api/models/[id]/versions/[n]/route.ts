import { z } from 'zod';
import { route, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { getVersion } from '@/lib/models/service';

const params = z.object({ id: z.uuid(), n: z.coerce.number().int().min(1) });

export const GET = route<{ id: string; n: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id, n } = parseParams(await ctx.params, params);
  return json({ version: await getVersion(m, id, n) });
});
