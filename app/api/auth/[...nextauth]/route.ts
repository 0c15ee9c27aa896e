import NextAuth from 'next-auth';
import { NextResponse } from 'next/server';
import { authOptions } from '@/lib/auth/options';
import { takeMailAllowance } from '@/lib/auth/mail-limits';
import { clientAddress } from '@/lib/http/client-address';
import { AppError } from '@/lib/http/errors';
import { env } from '@/lib/env';

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

const handler = async (req: Request, ctx: unknown) => (await linkLimit(req)) ?? NextAuth(authOptions())(req, ctx);

export { handler as GET, handler as POST };
