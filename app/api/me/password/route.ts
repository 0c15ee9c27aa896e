import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { changePasswordSchema } from '@/lib/core/auth/schemas';
import { changePassword } from '@/lib/server/auth/password-change';
import { clientAddress } from '@/lib/server/http/client-address';

// Any member changes their own password; every session of theirs ends (the browser signs in again).
export const POST = route(async (req) => {
  const m = await requireMember('firm.read');
  const input = await readJson(req, changePasswordSchema);
  await changePassword(m, input, clientAddress(req));
  return json({ changed: true });
});
