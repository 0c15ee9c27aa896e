import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { getNotificationPrefs, setNotificationPrefs } from '@/db/notifications';
import { notificationPrefsSchema } from '@/lib/notifications/schemas';

/** The signed-in person's own choice of notification e-mails; nobody else's can be read or changed. */
export const GET = route(async () => {
  const m = await requireMember();
  return json({ prefs: await getNotificationPrefs(m.userId) });
});

export const PUT = route(async (req) => {
  const m = await requireMember();
  const patch = await readJson(req, notificationPrefsSchema);
  await writeTransaction(async (trx) => {
    await setNotificationPrefs(m.userId, patch, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'notifications.changed', targetType: 'user', targetId: m.userId, detail: patch }, trx);
  });
  return json({ prefs: await getNotificationPrefs(m.userId) });
});
