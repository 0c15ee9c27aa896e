import { route, parseParams } from '@/lib/server/http/handler';
import { fetchMailbox } from '@/lib/server/mail/dev-mailbox';
import { mailAttachmentParams } from '@/lib/server/http/params';

export const GET = route<{ id: string; index: string }>(async (req, ctx) => {
  const { id, index } = parseParams(await ctx.params, mailAttachmentParams);
  const res = await fetchMailbox(req, `/messages/${id}/attachments/${index}`);
  return new Response(res.body, {
    headers: {
      'Content-Type': res.headers.get('content-type') ?? 'application/octet-stream',
      'Content-Disposition': res.headers.get('content-disposition') ?? 'attachment',
    },
  });
});
