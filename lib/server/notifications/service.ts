import 'server-only';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { getNotificationPrefRows, listVersionsAwaitingCheck, setNotificationPrefs } from '@/db/notifications';
import type { Member } from '@/lib/server/auth/guard';
import { NOTIFICATION_KINDS, type NotificationKind } from '@/lib/core/notifications/kinds';
import type { NotificationPrefsInput } from './schemas';

export type NotificationPrefs = Record<NotificationKind, boolean>;

/** The signed-in person's own choices: every kind is on until they turn it off; unknown stored kinds are ignored. */
export async function notificationPrefs(m: Member): Promise<NotificationPrefs> {
  const out = Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, true])) as NotificationPrefs;
  for (const r of await getNotificationPrefRows(m.userId)) if ((NOTIFICATION_KINDS as readonly string[]).includes(r.kind)) out[r.kind as NotificationKind] = r.enabled;
  return out;
}

export async function changeNotificationPrefs(m: Member, patch: NotificationPrefsInput): Promise<NotificationPrefs> {
  await writeTransaction(async (trx) => {
    await setNotificationPrefs(m.userId, patch, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'notifications.changed', targetType: 'user', targetId: m.userId, detail: patch }, trx);
  });
  return notificationPrefs(m);
}

/** Versions of the firm's models that wait for this checker (never their own). */
export async function reviewsWaiting(m: Member) {
  const versions = await listVersionsAwaitingCheck(m.firmId, m.userId);
  return { count: versions.length, versions };
}
