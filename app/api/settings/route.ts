import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { settingsSchema } from '@/lib/core/auth/schemas';
import { changeFirmSettings, firmSettings } from '@/lib/server/firm/service';

export const GET = route(async () => {
  const m = await requireMember();
  return json(await firmSettings(m));
});

export const PATCH = route(async (req) => {
  const m = await requireMember('settings.manage');
  const patch = await readJson(req, settingsSchema);
  return json(await changeFirmSettings(m, patch));
});
