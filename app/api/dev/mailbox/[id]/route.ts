import { z } from 'zod';
import { route, json, parseParams } from '@/lib/http/handler';
import { fetchMailbox } from '@/lib/mail/dev-mailbox';

export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = parseParams(await ctx.params, z.object({ id: z.string().regex(/^[A-Za-z0-9_-]{1,80}$/) }));
  return json(await (await fetchMailbox(req, `/messages/${id}`)).json());
});
