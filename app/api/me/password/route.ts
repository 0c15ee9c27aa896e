import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { changePasswordSchema } from '@/lib/auth/schemas';
import { changePassword } from '@/lib/auth/password-change';
import { clientAddress } from '@/lib/http/client-address';

// Any member changes their own password; every session of theirs ends (the browser signs in again).
export const POST = route(async (req) => {
  const m = await requireMember('firm.read');
  const input = await readJson(req, changePasswordSchema);
  await changePassword(m, input, clientAddress(req));
  return json({ changed: true });
});
