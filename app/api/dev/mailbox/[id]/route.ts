import { route, json, parseParams } from '@/lib/server/http/handler';
import { fetchMailbox } from '@/lib/server/mail/dev-mailbox';
import { mailIdParams } from '@/lib/server/http/params';

export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = parseParams(await ctx.params, mailIdParams);
  return json(await (await fetchMailbox(req, `/messages/${id}`)).json());
});
