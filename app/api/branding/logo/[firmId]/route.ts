import { z } from 'zod';
import { route, parseParams } from '@/lib/http/handler';
import { notFound } from '@/lib/http/errors';
import { getLogo } from '@/db/logos';
import { logoResponse } from '@/lib/datasets/logo-http';

const params = z.object({ firmId: z.uuid() });

/** Public: widgets, embeds and PDFs show the firm's logo. Revalidated by ETag, so a new logo shows within minutes. */
export const GET = route<{ firmId: string }>(async (req, ctx) => {
  const { firmId } = parseParams(await ctx.params, params);
  const logo = await getLogo(firmId);
  if (!logo) throw notFound('That logo');
  return logoResponse(req, logo, 'public, max-age=300, must-revalidate');
});
