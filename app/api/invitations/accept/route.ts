import { route, readJson, json } from '@/lib/http/handler';
import { acceptInvitationSchema } from '@/lib/auth/schemas';
import { acceptInvitation } from '@/lib/team/accounts';

export const POST = route(async (req) => {
  const input = await readJson(req, acceptInvitationSchema);
  return json(await acceptInvitation(input), 201);
});
