import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { checkoutSchema } from '@/lib/core/billing/schemas';
import { startCheckout } from '@/lib/server/billing/service';

// Opens a Checkout session for the signed-in owner's own firm; the browser is sent to the returned URL.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  const { seats } = await readJson(req, checkoutSchema);
  return json(await startCheckout(m, seats), 201);
});
