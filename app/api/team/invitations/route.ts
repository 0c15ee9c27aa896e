import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { inviteSchema } from '@/lib/core/auth/schemas';
import { inviteMember } from '@/lib/server/team/accounts';

export const POST = route(async (req) => {
  const m = await requireMember('team.manage');
  const input = await readJson(req, inviteSchema);
  const invitation = await inviteMember(m, input);
  return json({ invitation }, 201);
});
