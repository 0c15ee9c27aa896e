import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { seatChangeSchema } from '@/lib/core/billing/schemas';
import { changeSeats } from '@/lib/server/billing/service';

// 202: Stripe accepted the change; the billing record follows when its webhook arrives.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  const input = await readJson(req, seatChangeSchema);
  return json(await changeSeats(m, input), 202);
});
