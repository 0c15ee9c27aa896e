import { route, readJson, json } from '@/lib/server/http/handler';
import { confirmSignUpSchema } from '@/lib/core/auth/schemas';
import { confirmSignUp } from '@/lib/server/auth/sign-up';
import { clientAddress } from '@/lib/server/http/client-address';

// The e-mailed link's token and the password chosen at sign-up: creates the firm and its owner.
export const POST = route(async (req) => {
  const input = await readJson(req, confirmSignUpSchema);
  return json(await confirmSignUp(input, clientAddress(req)), 201);
});
