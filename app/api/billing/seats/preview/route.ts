import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { seatPreviewSchema } from '@/lib/core/billing/schemas';
import { previewSeatChange } from '@/lib/server/billing/service';

// What a seat change would charge (or credit) now, without changing anything.
export const POST = route(async (req) => {
  const m = await requireMember('billing.manage');
  const { seats } = await readJson(req, seatPreviewSchema);
  return json({ preview: await previewSeatChange(m, seats) });
});
