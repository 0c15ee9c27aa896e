import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';
import { notFound } from '@/lib/http/errors';
import { toErrorResponse } from '@/lib/http/handler';

// next-auth answers an action it does not know with 500 ("problem with the server configuration"); only the
// actions and providers this app uses reach it, anything else gets the usual 404.
const ACTIONS: Record<string, { methods: readonly string[]; providers?: readonly string[]; providerRequired?: boolean }> = {
  providers: { methods: ['GET'] },
  session: { methods: ['GET', 'POST'] },
  csrf: { methods: ['GET'] },
  signin: { methods: ['GET', 'POST'], providers: ['credentials', 'email'] },
  signout: { methods: ['GET', 'POST'] },
  callback: { methods: ['GET', 'POST'], providers: ['credentials', 'email'], providerRequired: true },
  'verify-request': { methods: ['GET'] },
  error: { methods: ['GET'] },
  _log: { methods: ['POST'] },
};

function known(method: string, segments: readonly string[]): boolean {
  const [action, provider, ...rest] = segments;
  const spec = action ? ACTIONS[action] : undefined;
  if (!spec || rest.length > 0 || !spec.methods.includes(method)) return false;
  if (provider === undefined) return !spec.providerRequired;
  return Boolean(spec.providers?.includes(provider));
}

const handler = async (req: Request, ctx: { params: Promise<{ nextauth?: string[] }> }) => {
  const { nextauth } = await ctx.params;
  if (!known(req.method, nextauth ?? [])) return toErrorResponse(notFound('That sign-in address'));
  return NextAuth(authOptions())(req, ctx);
};

export { handler as GET, handler as POST };
