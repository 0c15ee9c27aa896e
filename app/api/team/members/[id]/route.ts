import { route, readJson, json, noContent, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { roleChangeSchema } from '@/lib/core/auth/schemas';
import { changeRole, removeMember } from '@/lib/server/team/accounts';
import { idParams } from '@/lib/server/http/params';

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  const { role } = await readJson(req, roleChangeSchema);
  return json({ member: await changeRole(m, id, role) });
});

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('team.manage');
  const { id } = parseParams(await ctx.params, idParams);
  await removeMember(m, id);
  return noContent();
});
