import { route, readJson, json } from '@/lib/server/http/handler';
import { signUpSchema } from '@/lib/core/auth/schemas';
import { requestSignUp } from '@/lib/server/auth/sign-up';
import { clientAddress } from '@/lib/server/http/client-address';

// 202 and the same body whether or not the address already has an account: the e-mail says which.
export const POST = route(async (req) => {
  const input = await readJson(req, signUpSchema);
  await requestSignUp(input, clientAddress(req));
  return json({ email: input.email }, 202);
});
