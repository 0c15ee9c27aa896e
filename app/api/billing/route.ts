import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { billingSummary } from '@/lib/billing/service';

export const dynamic = 'force-dynamic';

export const GET = route(async () => {
  const m = await requireMember('billing.manage');
  return json(await billingSummary(m));
});
