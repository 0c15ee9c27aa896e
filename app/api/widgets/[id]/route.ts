import { z } from 'zod';
import { route, readJson, json, noContent, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { getWidget } from '@/db/widgets';
import { notFound } from '@/lib/http/errors';
import { widgetPatchSchema } from '@/lib/models/schemas';
import { changeWidget, takeDown } from '@/lib/models/service';

const params = z.object({ id: z.uuid() });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, params);
  const w = await getWidget(m.firmId, id);
  if (!w) throw notFound('That widget');
  return json({ widget: w });
});

/** Presentation changes, or an explicit republish of another version (`versionId`). */
export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('widgets.publish');
  const { id } = parseParams(await ctx.params, params);
  const patch = await readJson(req, widgetPatchSchema);
  return json({ widget: await changeWidget(m, id, patch) });
});

/** Takes the widget down: clients no longer see it; the record stays for the audit trail. */
export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('widgets.publish');
  const { id } = parseParams(await ctx.params, params);
  await takeDown(m, id);
  return noContent();
});
