import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { reviewsWaiting } from '@/lib/server/notifications/service';

/** Versions of the firm's models that wait for the signed-in checker (never their own). */
export const GET = route(async () => {
  const m = await requireMember('versions.check');
  return json(await reviewsWaiting(m));
});
