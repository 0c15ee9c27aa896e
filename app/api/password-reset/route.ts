import { route, readJson, json } from '@/lib/server/http/handler';
import { passwordResetRequestSchema } from '@/lib/core/auth/schemas';
import { requestPasswordReset } from '@/lib/server/auth/password-change';
import { clientAddress } from '@/lib/server/http/client-address';

// 202 and the same body whether or not the address has an account.
export const POST = route(async (req) => {
  const { email } = await readJson(req, passwordResetRequestSchema);
  await requestPasswordReset(email, clientAddress(req));
  return json({ email }, 202);
});
