import { route, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { getVersion } from '@/lib/server/models/service';
import { versionParams } from '@/lib/server/http/params';

export const GET = route<{ id: string; n: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id, n } = parseParams(await ctx.params, versionParams);
  return json({ version: await getVersion(m, id, n) });
});
