import { route, readJson, json } from '@/lib/http/handler';
import { signUpSchema } from '@/lib/auth/schemas';
import { signUp } from '@/lib/team/accounts';

export const POST = route(async (req) => {
  const input = await readJson(req, signUpSchema);
  await signUp(input);
  return json({ email: input.email }, 201);
});
