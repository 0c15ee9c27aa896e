import NextAuth from 'next-auth';
import { NextRequest, NextResponse } from 'next/server';
import { authOptions } from '@/lib/server/auth/options';
import { takeMailAllowance } from '@/lib/server/auth/mail-limits';
import { clientAddress } from '@/lib/server/http/client-address';
import { AppError, notFound } from '@/lib/server/http/errors';
import { readBody, toErrorResponse } from '@/lib/server/http/handler';
import { env } from '@/lib/server/env';

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

/** next-auth's own reading of an address (NFKC, trimmed, lower case, nothing after a comma in the domain), so a variant cannot dodge the limit. */
function normaliseIdentifier(raw: string): string | null {
  const [local, domain, ...rest] = raw.normalize('NFKC').trim().toLowerCase().split('@');
  if (!local || !domain || rest.length) return null;
  return `${local}@${domain.split(',')[0]}`;
}

/**
 * Sign-in links are e-mails anyone can ask for: the limits apply before next-auth sends one. A refusal is a 429 with
 * Retry-After whose body also carries next-auth's `{ url }` with the message as `error`, which its browser helper reads.
 */
async function linkLimit(req: Request): Promise<Response | null> {
  if (req.method !== 'POST' || !new URL(req.url).pathname.endsWith('/signin/email')) return null;
  const form = await req
    .clone()
    .formData()
    .catch(() => null);
  const raw = form?.get('email');
  const email = typeof raw === 'string' ? normaliseIdentifier(raw) : null;
  if (!email) return null;
  try {
    await takeMailAllowance('sign-in-link', { recipient: email, client: clientAddress(req) });
    return null;
  } catch (err) {
    if (!(err instanceof AppError) || err.code !== 'rate_limited') throw err;
    const url = `${env().APP_URL.replace(/\/+$/, '')}/sign-in?${new URLSearchParams({ error: err.message })}`;
    return NextResponse.json(
      { url, error: { code: err.code, message: err.message, retryAfter: err.retryAfter } },
      { status: 429, headers: { 'Retry-After': String(err.retryAfter ?? 3600) } },
    );
  }
}

const handler = async (req: NextRequest, ctx: { params: Promise<{ nextauth?: string[] }> }) => {
  try {
    const { nextauth } = await ctx.params;
    if (!known(req.method, nextauth ?? [])) throw notFound('That sign-in address');
    if (req.method === 'POST') {
      const bytes = await readBody(req, AUTH_BODY_LIMIT, 'sign-in form');
      req = new NextRequest(req.url, { method: 'POST', headers: req.headers, body: bytes as BodyInit });
    }
    return (await linkLimit(req)) ?? (await NextAuth(authOptions())(req, ctx));
  } catch (err) {
    return toErrorResponse(err);
  }
};

export { handler as GET, handler as POST };
