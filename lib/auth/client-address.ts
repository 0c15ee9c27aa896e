import 'server-only';

/**
 * The address a request came from, for rate limits. Kept in one place so that a proxy-aware version
 * (trusted proxies only) replaces it everywhere at once.
 */
export function clientAddress(headers: Headers | Record<string, unknown> | undefined): string {
  const get = (name: string): unknown => (headers instanceof Headers ? headers.get(name) : headers?.[name]);
  const fwd = get('x-forwarded-for');
  const first = typeof fwd === 'string' ? fwd.split(',')[0]?.trim() : undefined;
  const real = get('x-real-ip');
  return first || (typeof real === 'string' && real ? real : 'local');
}
