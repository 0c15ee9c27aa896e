import { z } from 'zod';
import { route, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { notFound } from '@/lib/http/errors';
import { getPass, passDailyCounts } from '@/db/passes';
import { passView } from '@/lib/embed/service';

const params = z.object({ id: z.uuid() });
const DAYS = 30;

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('firm.read');
  const { id } = parseParams(await ctx.params, params);
  const p = await getPass(m.firmId, id);
  if (!p) throw notFound('That pass');
  return json({ pass: { ...(await passView(p)), daily: await passDailyCounts(m.firmId, id, DAYS) } });
});
