import { route, parseParams } from '@/lib/server/http/handler';
import { firmIdParams } from '@/lib/server/http/params';
import { logoResponse } from '@/lib/server/datasets/logo-http';
import { publicLogo } from '@/lib/server/firm/service';

/** Public: widgets, embeds and PDFs show the firm's logo. Revalidated by ETag, so a new logo shows within minutes. */
export const GET = route<{ firmId: string }>(async (req, ctx) => {
  const { firmId } = parseParams(await ctx.params, firmIdParams);
  return logoResponse(req, await publicLogo(firmId), 'public, max-age=300, must-revalidate');
});
