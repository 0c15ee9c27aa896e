import { NextResponse, type NextRequest } from 'next/server';

// Redirects only: signed-out visitors of the dashboard go to sign-in. Authorization happens in the server layer.
export function proxy(req: NextRequest) {
  const hasSession = req.cookies.has('next-auth.session-token') || req.cookies.has('__Secure-next-auth.session-token');
  if (!hasSession) {
    const url = new URL('/sign-in', req.url);
    url.searchParams.set('next', req.nextUrl.pathname);
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = { matcher: ['/app/:path*'] };
