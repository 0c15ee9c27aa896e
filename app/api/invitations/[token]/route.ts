import { z } from 'zod';
import { route, json, parseParams } from '@/lib/server/http/handler';
import { describeInvitation } from '@/lib/server/team/accounts';

// Public: the token in the path is the credential.
export const GET = route<{ token: string }>(async (_req, ctx) => {
  const { token } = parseParams(await ctx.params, z.object({ token: z.string().min(20).max(200) }));
  return json(await describeInvitation(token));
});
