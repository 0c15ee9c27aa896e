import { route, readJson, json } from '@/lib/server/http/handler';
import { acceptInvitationSchema } from '@/lib/core/auth/schemas';
import { acceptInvitation } from '@/lib/server/team/accounts';

export const POST = route(async (req) => {
  const input = await readJson(req, acceptInvitationSchema);
  return json(await acceptInvitation(input), 201);
});
