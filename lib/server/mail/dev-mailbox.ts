import 'server-only';
import { env, isLoopbackHost } from '@/lib/server/env';
import { AppError, notFound } from '@/lib/server/http/errors';

const isLoopbackAddress = (a: string) => /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+)$/i.test(a.trim());

/**
 * The development mailbox shows every sign-in link and invitation, so it exists only while mail goes to the
 * local fake, and it answers only requests made on this machine (loopback Host, loopback client).
 */
export function mailboxOpenFor(headers: Headers): boolean {
  const e = env();
  if (e.realSmtp || !isLoopbackHost(new URL(e.FAKE_MAILBOX_URL).hostname)) return false;
  const host = headers.get('host');
  if (!host) return false;
  let hostname: string;
  try {
    hostname = new URL(`http://${host}`).hostname;
  } catch {
    return false;
  }
  if (!isLoopbackHost(hostname)) return false;
  // next start fills X-Forwarded-For with the socket's address when no proxy set it.
  const hops = (headers.get('x-forwarded-for') ?? '').split(',').filter((h) => h.trim());
  return hops.every(isLoopbackAddress);
}

/** The development mailbox reads the local SMTP fake's HTTP API; elsewhere it does not exist. */
export async function fetchMailbox(req: Request, path: string): Promise<Response> {
  const e = env();
  if (!mailboxOpenFor(req.headers)) throw notFound('The development mailbox');
  let res: Response;
  try {
    res = await fetch(new URL(path, e.FAKE_MAILBOX_URL), { cache: 'no-store' });
  } catch {
    throw new AppError('internal', 'The local mail server is not running. Start the demo with `npm run demo`.');
  }
  if (res.status === 404) throw notFound('That message');
  if (!res.ok) throw new AppError('internal', `The local mail server answered ${res.status}.`);
  return res;
}
