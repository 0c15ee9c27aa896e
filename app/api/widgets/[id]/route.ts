import { route, readJson, json, noContent, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { widgetPatchSchema } from '@/lib/server/models/schemas';
import { changeWidget, takeDown, widgetDetail } from '@/lib/server/models/service';
import { idParams } from '@/lib/server/http/params';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, idParams);
  return json({ widget: await widgetDetail(m, id) });
});

/** Presentation changes, or an explicit republish of another version (`versionId`). */
export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const m = await requireMember('widgets.publish');
  const { id } = parseParams(await ctx.params, idParams);
  const patch = await readJson(req, widgetPatchSchema);
  return json({ widget: await changeWidget(m, id, patch) });
});

/** Takes the widget down: clients no longer see it; the record stays for the audit trail. */
export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('widgets.publish');
  const { id } = parseParams(await ctx.params, idParams);
  await takeDown(m, id);
  return noContent();
});
