import { route, readJson, json } from '@/lib/server/http/handler';
import { resetPasswordSchema } from '@/lib/core/auth/schemas';
import { resetPassword } from '@/lib/server/auth/password-change';

// The e-mailed link's token and the new password; the token is the credential, so no session is needed.
export const POST = route(async (req) => {
  const input = await readJson(req, resetPasswordSchema);
  return json(await resetPassword(input));
});
