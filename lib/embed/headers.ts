import 'server-only';
import { checkPass } from '@/lib/embed/access';

// Response headers for /embed/... (called from proxy.ts, which runs on the Node runtime).
// The app-wide headers in next.config.mjs skip /embed/ because frame-ancestors here depends on the pass.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

const COMMON: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=()',
};

/** frame-ancestors with exactly these origins, or 'none'. */
export function embedCsp(origins: readonly string[]): string {
  const ancestors = origins.length ? origins.join(' ') : "'none'";
  return `frame-ancestors ${ancestors}; base-uri 'none'; object-src 'none'; form-action 'self'`;
}

/**
 * Headers for one /embed/ request. The embed page may be framed by exactly its client's allowed origins; a
 * refusal page (no data on it) by the origins of the client its pass names, so the viewer reads why, or by
 * nobody when no client is known. The loader script is a public, cross-origin resource.
 */
export async function embedResponseHeaders(pathname: string, search: URLSearchParams): Promise<Record<string, string>> {
  const m = /^\/embed\/([^/]+)\/?$/.exec(pathname);
  if (!m || m[1]!.includes('.')) {
    // Not a page: nothing may frame it, but any site may load it as a script.
    return { ...COMMON, 'Content-Security-Policy': "frame-ancestors 'none'", 'Cross-Origin-Resource-Policy': 'cross-origin', 'Referrer-Policy': 'no-referrer' };
  }
  const passId = decodeURIComponent(m[1]!);
  const r = await checkPass(UUID.test(passId) ? passId : null, search.get('pass'));
  const origins = r.ok ? r.client.allowedOrigins : (r.client?.allowedOrigins ?? []);
  return {
    ...COMMON,
    'Content-Security-Policy': embedCsp(origins),
    'Referrer-Policy': 'no-referrer',
    'Cache-Control': 'private, no-store',
    'X-Robots-Tag': 'noindex',
  };
}
