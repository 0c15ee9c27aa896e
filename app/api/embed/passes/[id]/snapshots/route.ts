import { route, readJson, json } from '@/lib/server/http/handler';
import { requireViewer } from '@/lib/server/embed/access';
import { snapshotRequestSchema } from '@/lib/server/snapshots/schemas';
import { requestSnapshot, requesterHash } from '@/lib/server/snapshots/request';

// "E-mail this view": checks the bearer, the address, the dial values and the limits, then queues a job (202).
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = await ctx.params;
  const v = await requireViewer(req, id);
  const input = await readJson(req, snapshotRequestSchema);
  const accepted = await requestSnapshot(v, input, requesterHash(req));
  return json(accepted, 202);
});
