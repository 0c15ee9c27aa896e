import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { PERMISSIONS, can, type Permission } from '@/lib/core/auth/permissions';
import type { Me } from '@/lib/core/api-types';

export const GET = route(async () => {
  const m = await requireMember();
  const permissions = (Object.keys(PERMISSIONS) as Permission[]).filter((p) => can(m.role, p));
  return json<Me>({ user: { id: m.userId, name: m.name, email: m.email }, firm: { id: m.firmId, name: m.firmName }, role: m.role, permissions });
});
