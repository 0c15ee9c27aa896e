import 'server-only';
import { checkPassFrame } from '@/lib/server/embed/access';
import { contentSecurityPolicy } from '@/lib/server/http/csp';
import { env } from '@/lib/server/env';
import type { FrameVerdict } from '@/lib/core/embed/frame-verdict';

// Response headers for /embed/... (called from proxy.ts, which runs on the Node runtime).
// The app-wide headers in next.config.mjs skip /embed/ because frame-ancestors here depends on the pass.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

const COMMON: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=()',
};

/**
 * The embed page's own policy: framed by exactly these origins (or 'none'), scripts only from the app with this
 * response's nonce, no base URL changes, forms to itself only.
 */
export function embedCsp(origins: readonly string[], nonce = ''): string {
  const e = env();
  const ancestors = origins.length ? origins.join(' ') : "'none'";
  return contentSecurityPolicy({ nonce: nonce || 'none', appUrl: e.APP_URL, development: e.NODE_ENV === 'development', frameAncestors: ancestors, embed: true });
}

/**
 * Headers for one /embed/ request, and for a page, the check's verdict (which proxy.ts hands to the page). The embed
 * page may be framed by exactly the allowed origins of the client its pass belongs to (a refusal page too, so the
 * viewer reads why), or by nobody when the pass is unknown. The loader script is a public, cross-origin resource.
 */
export async function embedFrame(pathname: string, nonce = ''): Promise<{ headers: Record<string, string>; verdict: FrameVerdict | null }> {
  const m = /^\/embed\/([^/]+)\/?$/.exec(pathname);
  if (!m || m[1]!.includes('.')) {
    // Not a page: nothing may frame it, but any site may load it as a script.
    return { headers: { ...COMMON, 'Content-Security-Policy': "frame-ancestors 'none'", 'Cross-Origin-Resource-Policy': 'cross-origin', 'Referrer-Policy': 'no-referrer' }, verdict: null };
  }
  let passId: string | null = null;
  try {
    passId = decodeURIComponent(m[1]!);
  } catch {
    // A malformed escape names no pass.
  }
  // By pass id alone: the token is never in the URL.
  const r = await checkPassFrame(passId && UUID.test(passId) ? passId : null);
  const origins = r.client?.allowedOrigins ?? [];
  const verdict: FrameVerdict = r.ok
    ? { kind: 'framable', passId: r.pass.id, firmName: r.firmName, allowedOrigins: [...origins] }
    : { kind: 'refused', failure: r.failure, firmName: r.firmName, allowedOrigins: [...origins] };
  return {
    headers: {
      ...COMMON,
      'Content-Security-Policy': embedCsp(origins, nonce),
      'Referrer-Policy': 'no-referrer',
      'Cache-Control': 'private, no-store',
      'X-Robots-Tag': 'noindex',
    },
    verdict,
  };
}
