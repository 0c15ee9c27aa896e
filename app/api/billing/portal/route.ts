import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { emptySchema } from '@/lib/billing/schemas';
import { openPortal } from '@/lib/billing/service';

export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  await readJson(req, emptySchema);
  return json(await openPortal(m), 201);
});
