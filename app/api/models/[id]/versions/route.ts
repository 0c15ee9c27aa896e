import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { idParams } from '@/lib/server/http/params';
import { saveVersionSchema } from '@/lib/server/models/schemas';
import { saveVersion, versionList } from '@/lib/server/models/service';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ versions: await versionList(m, id) });
});

/** Saves a new immutable version; 409 when someone saved a newer one since `baseVersion`. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('models.edit');
  const { id } = parseParams(await ctx.params, idParams);
  const input = await readJson(req, saveVersionSchema);
  return json({ version: await saveVersion(m, id, input) }, 201);
});
