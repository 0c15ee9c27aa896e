import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { emptySchema } from '@/lib/core/billing/schemas';
import { setCancelAtPeriodEnd } from '@/lib/server/billing/service';

// Withdraws a scheduled cancellation.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  await readJson(req, emptySchema);
  return json(await setCancelAtPeriodEnd(m, false), 202);
});
