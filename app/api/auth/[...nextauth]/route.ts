import NextAuth from 'next-auth';
import { NextRequest } from 'next/server';
import { authOptions } from '@/lib/auth/options';
import { notFound } from '@/lib/http/errors';
import { readBody, toErrorResponse } from '@/lib/http/handler';

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

// Sign-in forms are a few hundred bytes; next-auth would read any body whole, so it gets at most 64 KiB.
const AUTH_BODY_LIMIT = 64 * 1024;

const handler = async (req: NextRequest, ctx: { params: Promise<{ nextauth?: string[] }> }) => {
  try {
    const { nextauth } = await ctx.params;
    if (!known(req.method, nextauth ?? [])) throw notFound('That sign-in address');
    if (req.method === 'POST') {
      const bytes = await readBody(req, AUTH_BODY_LIMIT, 'sign-in form');
      req = new NextRequest(req.url, { method: 'POST', headers: req.headers, body: bytes as BodyInit });
    }
    return await NextAuth(authOptions())(req, ctx);
  } catch (err) {
    return toErrorResponse(err);
  }
};

export { handler as GET, handler as POST };
