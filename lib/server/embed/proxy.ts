import 'server-only';
import { NextResponse, type NextRequest } from 'next/server';
import { embedResponseHeaders, embedCsp } from '@/lib/server/embed/headers';
import { newNonce } from '@/lib/server/http/csp';

/**
 * proxy.ts hands every /embed/... request here. On any failure the page may be framed by nobody. The policy goes
 * on the request too, so Next puts this response's nonce on its scripts.
 */
export async function embedProxy(req: NextRequest): Promise<NextResponse> {
  const nonce = newNonce();
  let headers: Record<string, string>;
  try {
    headers = await embedResponseHeaders(req.nextUrl.pathname, nonce);
  } catch (err) {
    console.error('[embed headers]', err);
    headers = { 'Content-Security-Policy': embedCsp([], nonce), 'Referrer-Policy': 'no-referrer', 'X-Content-Type-Options': 'nosniff' };
  }
  const forward = new Headers(req.headers);
  forward.set('x-nonce', nonce);
  forward.set('content-security-policy', headers['Content-Security-Policy']!);
  const res = NextResponse.next({ request: { headers: forward } });
  for (const [k, v] of Object.entries(headers)) res.headers.set(k, v);
  return res;
}
