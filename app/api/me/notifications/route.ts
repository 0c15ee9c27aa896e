import { route, readJson, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { notificationPrefsSchema } from '@/lib/server/notifications/schemas';
import { changeNotificationPrefs, notificationPrefs } from '@/lib/server/notifications/service';

/** The signed-in person's own choice of notification e-mails; nobody else's can be read or changed. */
export const GET = route(async () => {
  const m = await requireMember();
  return json({ prefs: await notificationPrefs(m) });
});

export const PUT = route(async (req) => {
  const m = await requireMember();
  const patch = await readJson(req, notificationPrefsSchema);
  return json({ prefs: await changeNotificationPrefs(m, patch) });
});
