// Content-Security-Policy of the app's pages and of the embed page, built per request around a fresh nonce.
// proxy.ts sets it on the response and on the request (Next reads the nonce from the request's policy and puts
// it on its own scripts; every page renders dynamically so each response gets its own nonce).

export interface CspOptions {
  nonce: string;
  /** The app's own URL (APP_URL). */
  appUrl: string;
  /** `next dev` needs eval for its tooling; a production build never does. */
  development: boolean;
  /** Who may frame the page: "'none'" for the app, the client's allowed origins for an embed page. */
  frameAncestors?: string;
  /** The embed page gets no base URL changes and posts no forms elsewhere. */
  embed?: boolean;
}

const isLocalHttp = (url: URL) => url.protocol === 'http:' && ['localhost', '127.0.0.1', '[::1]'].includes(url.hostname);

export function contentSecurityPolicy(o: CspOptions): string {
  const app = new URL(o.appUrl);
  // A local demo or test stack over http may be reached as localhost or 127.0.0.1 and next-auth redirects a
  // form post to APP_URL's spelling; an https deployment posts forms to itself only.
  const formAction = o.embed ? "'self'" : isLocalHttp(app) ? `'self' ${app.origin} http://localhost:* http://127.0.0.1:*` : `'self' ${app.origin}`;
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${o.nonce}'${o.development ? " 'unsafe-eval'" : ''}`,
    // React sets style attributes (brand colours, chart sizes); styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "object-src 'none'",
    `base-uri ${o.embed ? "'none'" : "'self'"}`,
    `form-action ${formAction}`,
    `frame-ancestors ${o.frameAncestors ?? "'none'"}`,
  ];
  if (app.protocol === 'https:' && !o.development) directives.push('upgrade-insecure-requests');
  return directives.join('; ');
}

/** HSTS for an https deployment (production build); a year, subdomains included (common practice, no source). */
export function hstsHeader(appUrl: string, development: boolean): string | null {
  return !development && new URL(appUrl).protocol === 'https:' ? 'max-age=31536000; includeSubDomains' : null;
}

/** A fresh nonce: 128 random bits, base64. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}
