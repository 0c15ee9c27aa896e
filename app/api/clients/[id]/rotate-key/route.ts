import { route, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { clientView, rotateKey } from '@/lib/server/embed/service';
import { idParams } from '@/lib/server/http/params';

// Rotating the key revokes every pass of the client at once; new passes use the new key.
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('clients.manage');
  const { id } = parseParams(await ctx.params, idParams);
  const { client, revokedPasses } = await rotateKey(m, id);
  return json({ client: clientView(client), revokedPasses });
});
