import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { emptySchema } from '@/lib/core/billing/schemas';
import { openPortal } from '@/lib/server/billing/service';

export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  await readJson(req, emptySchema);
  return json(await openPortal(m), 201);
});
