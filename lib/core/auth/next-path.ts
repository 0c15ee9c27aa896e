/**
 * Where to go after sign-in. Only paths of this app's own origin pass: the value is parsed against the
 * origin, as the browser will resolve it, so `/%09/evil.example` or `/\evil.example` cannot leave the site.
 */
export function safeNext(value: unknown, origin: string, fallback = '/app'): string {
  if (typeof value !== 'string' || value.length === 0 || value.length > 2000) return fallback;
  let base: URL;
  let url: URL;
  try {
    base = new URL(origin);
    url = new URL(value, base);
  } catch {
    return fallback;
  }
  if (url.origin !== base.origin) return fallback;
  // A path that starts with two slashes would be read as another host when used as a relative link.
  if (url.pathname.startsWith('//') || url.pathname.startsWith('/\\')) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}
