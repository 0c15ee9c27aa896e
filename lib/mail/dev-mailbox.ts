import 'server-only';
import { env } from '@/lib/env';
import { AppError, notFound } from '@/lib/http/errors';

/** The development mailbox reads the local SMTP fake's HTTP API; it does not exist once a real relay is set. */
export async function fetchMailbox(path: string): Promise<Response> {
  const e = env();
  if (e.realSmtp) throw notFound('The development mailbox');
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
