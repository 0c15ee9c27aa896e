import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { seatChangeSchema } from '@/lib/billing/schemas';
import { changeSeats } from '@/lib/billing/service';

// 202: Stripe accepted the change; the billing record follows when its webhook arrives.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  const input = await readJson(req, seatChangeSchema);
  return json(await changeSeats(m, input), 202);
});
