import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { settingsSchema } from '@/lib/auth/schemas';
import { changeFirmSettings, firmSettings } from '@/lib/firm/service';

export const GET = route(async () => {
  const m = await requireMember();
  return json(await firmSettings(m));
});

export const PATCH = route(async (req) => {
  const m = await requireMember('settings.manage');
  const patch = await readJson(req, settingsSchema);
  return json(await changeFirmSettings(m, patch));
});
