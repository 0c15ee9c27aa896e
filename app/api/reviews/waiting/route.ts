import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { listVersionsAwaitingCheck } from '@/db/notifications';

/** Versions of the firm's models that wait for the signed-in checker (never their own). */
export const GET = route(async () => {
  const m = await requireMember('versions.check');
  const versions = await listVersionsAwaitingCheck(m.firmId, m.userId);
  return json({ count: versions.length, versions });
});
