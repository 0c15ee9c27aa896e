import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { billingSummary } from '@/lib/server/billing/service';

export const dynamic = 'force-dynamic';

export const GET = route(async () => {
  const m = await requireMember('billing.manage');
  return json(await billingSummary(m));
});
