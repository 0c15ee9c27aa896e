import 'server-only';
import { NextResponse, type NextRequest } from 'next/server';
import { embedFrame, embedCsp } from '@/lib/server/embed/headers';
import { newNonce } from '@/lib/server/http/csp';
import { logger } from '@/lib/server/ops/log';
import { encodeFrameVerdict, FRAME_VERDICT_HEADER, type FrameVerdict } from '@/lib/core/embed/frame-verdict';

/**
 * proxy.ts hands every /embed/... request here. On any failure the page may be framed by nobody. The policy goes
 * on the request too, so Next puts this response's nonce on its scripts, and so does the pass check's verdict, which
 * the page (pages/embed/[passId].tsx) shows; a verdict the browser sent is always replaced or removed.
 */
export async function embedProxy(req: NextRequest): Promise<NextResponse> {
  const nonce = newNonce();
  let headers: Record<string, string>;
  let verdict: FrameVerdict | null;
  try {
    ({ headers, verdict } = await embedFrame(req.nextUrl.pathname, nonce));
  } catch (err) {
    // The reference the page's error screen shows is the one this log line carries.
    const reference = crypto.randomUUID().replace(/-/g, '').slice(0, 10);
    const given = req.headers.get('x-request-id');
    logger().error({ digest: reference, reqId: given ?? undefined, method: req.method, path: req.nextUrl.pathname, route: '/embed/[passId]', kind: 'render', err }, 'render error');
    headers = { 'Content-Security-Policy': embedCsp([], nonce), 'Referrer-Policy': 'no-referrer', 'X-Content-Type-Options': 'nosniff' };
    verdict = { kind: 'error', reference };
  }
  const forward = new Headers(req.headers);
  forward.set('x-nonce', nonce);
  forward.set('content-security-policy', headers['Content-Security-Policy']!);
  if (verdict) forward.set(FRAME_VERDICT_HEADER, encodeFrameVerdict(verdict));
  else forward.delete(FRAME_VERDICT_HEADER);
  const res = NextResponse.next({ request: { headers: forward } });
  for (const [k, v] of Object.entries(headers)) res.headers.set(k, v);
  return res;
}
