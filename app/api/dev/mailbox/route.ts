import { route, json } from '@/lib/server/http/handler';
import { fetchMailbox } from '@/lib/server/mail/dev-mailbox';

// Development only: open on this machine (loopback) while mail goes to the local fake.
export const GET = route(async (req) => {
  const to = req.nextUrl.searchParams.get('to');
  const res = await fetchMailbox(req, to ? `/messages?to=${encodeURIComponent(to)}` : '/messages');
  return json(await res.json());
});
