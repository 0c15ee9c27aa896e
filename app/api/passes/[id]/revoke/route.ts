import { route, json, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { passView, revokePass } from '@/lib/server/embed/service';
import { idParams } from '@/lib/server/http/params';

// Takes effect on the viewer's very next page load or API call: every embed request re-reads the pass.
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('clients.manage');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ pass: await passView(await revokePass(m, id)) });
});
