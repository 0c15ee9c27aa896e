import { route, json, parseParams } from '@/lib/http/handler';
import { fetchMailbox } from '@/lib/mail/dev-mailbox';
import { mailIdParams } from '@/lib/http/params';

export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = parseParams(await ctx.params, mailIdParams);
  return json(await (await fetchMailbox(req, `/messages/${id}`)).json());
});
