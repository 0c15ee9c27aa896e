import { route, readJson, json } from '@/lib/http/handler';
import { signUpSchema } from '@/lib/auth/schemas';
import { requestSignUp } from '@/lib/auth/sign-up';
import { clientAddress } from '@/lib/http/client-address';

// 202 and the same body whether or not the address already has an account: the e-mail says which.
export const POST = route(async (req) => {
  const input = await readJson(req, signUpSchema);
  await requestSignUp(input, clientAddress(req));
  return json({ email: input.email }, 202);
});
