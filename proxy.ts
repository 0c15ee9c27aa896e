import { NextResponse, type NextRequest } from 'next/server';
import { embedProxy } from '@/lib/embed/proxy';

// Redirects signed-out dashboard visitors to sign-in, and sets the per-client framing headers of embed pages.
// Authorization happens in the server layer, not here.
export async function proxy(req: NextRequest) {
  const { pathname } = req.nextUrl;
  if (pathname.startsWith('/embed/')) return embedProxy(req);
  const hasSession = req.cookies.has('next-auth.session-token') || req.cookies.has('__Secure-next-auth.session-token');
  if (!hasSession) {
    const url = new URL('/sign-in', req.url);
    url.searchParams.set('next', pathname);
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = { matcher: ['/app/:path*', '/embed/:path*'] };
