import { z } from 'zod';
import { route, readJson, json, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { getModel, listVersions } from '@/db/models';
import { notFound } from '@/lib/http/errors';
import { saveVersionSchema } from '@/lib/models/schemas';
import { saveVersion } from '@/lib/models/service';

const params = z.object({ id: z.uuid() });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, params);
  if (!(await getModel(m.firmId, id))) throw notFound('That model');
  return json({ versions: await listVersions(m.firmId, id) });
});

/** Saves a new immutable version; 409 when someone saved a newer one since `baseVersion`. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, params);
  const input = await readJson(req, saveVersionSchema);
  return json({ version: await saveVersion(m, id, input) }, 201);
});
