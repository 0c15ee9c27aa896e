import { NextResponse, type NextRequest } from 'next/server';
import { embedProxy } from '@/lib/server/embed/proxy';
import { contentSecurityPolicy, hstsHeader, newNonce } from '@/lib/server/http/csp';
import { FRAME_VERDICT_HEADER } from '@/lib/core/embed/frame-verdict';

// Every page gets a Content-Security-Policy with a fresh script nonce (set on the request too, so Next puts the
// nonce on its own scripts), and HSTS on an https deployment. Signed-out dashboard visitors are redirected to
// sign-in, and embed pages get their per-client framing policy. Authorization happens in the server layer.
export async function proxy(req: NextRequest) {
  const { pathname } = req.nextUrl;
  if (pathname.startsWith('/embed/')) return embedProxy(req);
  const appUrl = process.env.APP_URL || req.nextUrl.origin;
  const development = process.env.NODE_ENV === 'development';
  if (pathname === '/app' || pathname.startsWith('/app/')) {
    const hasSession = req.cookies.has('next-auth.session-token') || req.cookies.has('__Secure-next-auth.session-token');
    if (!hasSession) {
      const url = new URL('/sign-in', req.url);
      url.searchParams.set('next', pathname);
      return NextResponse.redirect(url);
    }
  }
  const nonce = newNonce();
  const csp = contentSecurityPolicy({ nonce, appUrl, development });
  const forward = new Headers(req.headers);
  forward.set('x-nonce', nonce);
  forward.set('content-security-policy', csp);
  // Only embedProxy may hand the embed page a pass verdict: never pass on one a browser sent.
  forward.delete(FRAME_VERDICT_HEADER);
  const res = NextResponse.next({ request: { headers: forward } });
  res.headers.set('Content-Security-Policy', csp);
  const hsts = hstsHeader(appUrl, development);
  if (hsts) res.headers.set('Strict-Transport-Security', hsts);
  return res;
}

// Pages only: API responses, static files and the icon take their headers from next.config.mjs.
export const config = { matcher: ['/((?!api/|_next/static|_next/image|icon\\.svg|favicon\\.ico).*)'] };
