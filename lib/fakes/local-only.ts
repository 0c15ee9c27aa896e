import type { IncomingMessage } from 'node:http';

const LOOPBACK = new Set(['localhost', '127.0.0.1', '[::1]']);

/**
 * Test-only endpoints of the local fakes answer requests made on this machine by scripts and the app, never a web page:
 * the Host must be a loopback name (a DNS-rebinding page sends its own host name) and an Origin, when a browser
 * sends one, must be the fake's own. Returns why a request is refused, or null.
 */
export function refuseUnlessLocal(req: IncomingMessage, ownOrigins: string[]): string | null {
  let hostname: string;
  try {
    hostname = new URL(`http://${req.headers.host ?? ''}`).hostname.toLowerCase();
  } catch {
    return 'Refused: this endpoint answers only requests addressed to localhost or 127.0.0.1.';
  }
  if (!LOOPBACK.has(hostname)) return 'Refused: this endpoint answers only requests addressed to localhost or 127.0.0.1.';
  const origin = req.headers.origin;
  if (origin !== undefined) {
    const own = new Set(ownOrigins.map((o) => new URL(o).origin));
    if (!own.has(origin)) return 'Refused: this test-only endpoint does not answer requests from web pages of other origins.';
  }
  return null;
}
