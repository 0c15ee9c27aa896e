import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { inviteSchema } from '@/lib/auth/schemas';
import { inviteMember } from '@/lib/team/accounts';

export const POST = route(async (req) => {
  const m = await requireMember('team.manage');
  const input = await readJson(req, inviteSchema);
  const invitation = await inviteMember(m, input);
  return json({ invitation }, 201);
});
