import { route, parseParams } from '@/lib/http/handler';
import { fetchMailbox } from '@/lib/mail/dev-mailbox';
import { mailAttachmentParams } from '@/lib/http/params';

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
