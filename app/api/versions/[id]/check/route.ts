import { route, readJson, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { checkSchema } from '@/lib/server/models/schemas';
import { checkVersion } from '@/lib/server/models/service';
import { idParams } from '@/lib/server/http/params';

/** A checker signs a version off or sends it back; never their own version, and only once. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('versions.check');
  const { id } = parseParams(await ctx.params, idParams);
  const input = await readJson(req, checkSchema);
  return json({ version: await checkVersion(m, id, input) });
});
