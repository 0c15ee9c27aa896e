import { z } from 'zod';
import { route, parseParams } from '@/lib/http/handler';
import { fetchMailbox } from '@/lib/mail/dev-mailbox';

export const GET = route<{ id: string; index: string }>(async (req, ctx) => {
  const { id, index } = parseParams(await ctx.params, z.object({ id: z.string().regex(/^[A-Za-z0-9_-]{1,80}$/), index: z.coerce.number().int().min(0).max(100) }));
  const res = await fetchMailbox(req, `/messages/${id}/attachments/${index}`);
  return new Response(res.body, {
    headers: {
      'Content-Type': res.headers.get('content-type') ?? 'application/octet-stream',
      'Content-Disposition': res.headers.get('content-disposition') ?? 'attachment',
    },
  });
});
