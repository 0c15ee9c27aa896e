import { route, parseParams } from '@/lib/http/handler';
import { firmIdParams } from '@/lib/http/params';
import { logoResponse } from '@/lib/datasets/logo-http';
import { publicLogo } from '@/lib/firm/service';

/** Public: widgets, embeds and PDFs show the firm's logo. Revalidated by ETag, so a new logo shows within minutes. */
export const GET = route<{ firmId: string }>(async (req, ctx) => {
  const { firmId } = parseParams(await ctx.params, firmIdParams);
  return logoResponse(req, await publicLogo(firmId), 'public, max-age=300, must-revalidate');
});
