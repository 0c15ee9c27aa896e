import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { reviewsWaiting } from '@/lib/notifications/service';

/** Versions of the firm's models that wait for the signed-in checker (never their own). */
export const GET = route(async () => {
  const m = await requireMember('versions.check');
  return json(await reviewsWaiting(m));
});
