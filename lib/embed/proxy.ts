import 'server-only';
import { NextResponse, type NextRequest } from 'next/server';
import { embedResponseHeaders, embedCsp } from '@/lib/embed/headers';

/** proxy.ts hands every /embed/... request here. On any failure the page may be framed by nobody. */
export async function embedProxy(req: NextRequest): Promise<NextResponse> {
  let headers: Record<string, string>;
  try {
    headers = await embedResponseHeaders(req.nextUrl.pathname, req.nextUrl.searchParams);
  } catch (err) {
    console.error('[embed headers]', err);
    headers = { 'Content-Security-Policy': embedCsp([]), 'Referrer-Policy': 'no-referrer', 'X-Content-Type-Options': 'nosniff' };
  }
  const res = NextResponse.next();
  for (const [k, v] of Object.entries(headers)) res.headers.set(k, v);
  return res;
}
