import { z } from 'zod';
import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { fieldError } from '@/lib/http/errors';
import { listSnapshotJobs } from '@/db/snapshots';

// The firm's snapshot requests and their delivery state, newest first; ?clientId= narrows to one client.
export const GET = route(async (req) => {
  const m = await requireMember('clients.manage');
  const raw = req.nextUrl.searchParams.get('clientId');
  const clientId = raw ? z.uuid().safeParse(raw) : null;
  if (clientId && !clientId.success) throw fieldError('clientId', 'This is not a client id.');
  return json({ snapshots: await listSnapshotJobs(m.firmId, { clientId: clientId?.data }) });
});
