import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { publishSchema } from '@/lib/server/models/schemas';
import { publish, widgetList } from '@/lib/server/models/service';

export const GET = route(async (req) => {
  const m = await requireMember('models.read');
  const all = req.nextUrl.searchParams.get('all');
  return json({ widgets: await widgetList(m, { includeUnpublished: all === '1' || all === 'true' }) });
});

/** Publishes a version of a model as a widget (checked versions only, unless the firm relaxed the rule). */
export const POST = route(async (req) => {
  const m = await requireMember('widgets.publish');
  const input = await readJson(req, publishSchema);
  return json({ widget: await publish(m, input) }, 201);
});
