import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { fieldError } from '@/lib/server/http/errors';
import { isUuid } from '@/lib/server/http/params';
import { snapshotList } from '@/lib/server/snapshots/service';

// The firm's snapshot requests and their delivery state, newest first; ?clientId= narrows to one client.
export const GET = route(async (req) => {
  const m = await requireMember('clients.manage');
  const raw = req.nextUrl.searchParams.get('clientId');
  if (raw && !isUuid(raw)) throw fieldError('clientId', 'This is not a client id.');
  return json({ snapshots: await snapshotList(m, raw || undefined) });
});
