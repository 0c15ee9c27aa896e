import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { emptySchema } from '@/lib/billing/schemas';
import { setCancelAtPeriodEnd } from '@/lib/billing/service';

// Withdraws a scheduled cancellation.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  await readJson(req, emptySchema);
  return json(await setCancelAtPeriodEnd(m, false), 202);
});
