import 'server-only';
import type { FirmLogo } from '@/db/logos';

/** The logo as an image response: nosniff, cacheable by its hash (ETag), loadable from embeds on other origins. */
export function logoResponse(req: Request, logo: FirmLogo, cacheControl: string): Response {
  const etag = `"${logo.hash}"`;
  const headers = {
    'Content-Type': logo.contentType,
    'X-Content-Type-Options': 'nosniff',
    'Cache-Control': cacheControl,
    ETag: etag,
    'Cross-Origin-Resource-Policy': 'cross-origin',
    'Content-Security-Policy': "default-src 'none'",
  };
  if (req.headers.get('if-none-match') === etag) return new Response(null, { status: 304, headers });
  return new Response(new Uint8Array(logo.bytes), { headers: { ...headers, 'Content-Length': String(logo.bytes.length) } });
}
