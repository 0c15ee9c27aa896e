import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { emptySchema } from '@/lib/billing/schemas';
import { setCancelAtPeriodEnd } from '@/lib/billing/service';

// Cancels at the end of the paid period; seats keep working until then.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  await readJson(req, emptySchema);
  return json(await setCancelAtPeriodEnd(m, true), 202);
});
