import 'server-only';
import type { Knex } from 'knex';
import { env } from '@/lib/server/env';
import { linkMail } from '@/lib/server/mail/send';
import { insertMailJob, listRecipients, wantsNotification } from '@/db/notifications';
import { NOTIFICATION_INFO, type NotificationKind } from '@/lib/core/notifications/kinds';

// Notification mails are queued inside the transaction that records the event (a version saved, checked, a widget
// published): the mail exists exactly when the event does, and the worker sends it later, surviving restarts and
// mail-server outages. The text is fixed at the time of the event.

const appUrl = (path: string) => `${env().APP_URL.replace(/\/+$/, '')}${path}`;

const FOOTER = 'You receive this because of your role in the firm. Turn this kind of e-mail off under Settings → My e-mail notifications.';

async function queue(trx: Knex.Transaction, firmId: string, kind: NotificationKind, eventKey: string, to: { userId: string; email: string }, subject: string, lines: string[], action: { label: string; url: string }): Promise<void> {
  const m = linkMail(to.email, subject, [...lines, FOOTER], action);
  await insertMailJob({ firmId, kind, userId: to.userId, recipient: to.email, subject, text: m.text, html: m.html ?? '', dedupeKey: `${kind}:${eventKey}:${to.userId}` }, trx);
}

export interface VersionEvent {
  firmId: string;
  versionId: string;
  modelId: string;
  modelTitle: string;
  number: number;
  authorId: string | null;
  authorName: string | null;
  note: string | null;
}

/** A saved version waits for a check: every checker of the firm except its author. */
export async function notifyCheckRequested(e: VersionEvent, trx: Knex.Transaction): Promise<number> {
  const to = await listRecipients(e.firmId, NOTIFICATION_INFO.check_requested.roles, 'check_requested', [e.authorId], trx);
  for (const r of to) {
    await queue(
      trx,
      e.firmId,
      'check_requested',
      e.versionId,
      r,
      `Check requested: ${e.modelTitle}, version ${e.number}`,
      [
        `${e.authorName ?? 'A member of your firm'} saved version ${e.number} of “${e.modelTitle}”. It waits for a checker to sign it off or send it back.`,
        e.note ? `The author’s note: “${e.note}”` : 'The author left no note.',
      ],
      { label: 'Open the comparison', url: appUrl(`/app/models/${e.modelId}/versions/${e.number}/check`) },
    );
  }
  return to.length;
}

/** A checker decided: the version's author hears which way, with the note. */
export async function notifyCheckDecided(e: VersionEvent & { decision: 'signed_off' | 'sent_back'; checkerName: string; checkNote: string | null; comments: number }, trx: Knex.Transaction): Promise<boolean> {
  if (!e.authorId) return false;
  const author = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where({ 'm.firm_id': e.firmId, 'm.user_id': e.authorId, 'm.status': 'active' })
    .select('u.id', 'u.email')
    .first();
  if (!author || !(await wantsNotification(author.id, 'check_decided', trx))) return false;
  const verb = e.decision === 'signed_off' ? 'signed off' : 'sent back';
  await queue(
    trx,
    e.firmId,
    'check_decided',
    e.versionId,
    { userId: author.id, email: author.email },
    `Version ${e.number} of ${e.modelTitle} was ${verb}`,
    [
      `${e.checkerName} ${verb} version ${e.number} of “${e.modelTitle}”.`,
      e.checkNote ? `The checker’s note: “${e.checkNote}”` : 'The checker left no note.',
      ...(e.comments ? [`There ${e.comments === 1 ? 'is 1 comment' : `are ${e.comments} comments`} on fields of the model.`] : []),
      e.decision === 'signed_off' ? 'The version can now be published.' : 'Save a corrected version to have it checked again.',
    ],
    { label: 'Open the version', url: appUrl(`/app/models/${e.modelId}/versions/${e.number}`) },
  );
  return true;
}

/** A widget went live (or moved to another version): the firm's owners, except the one who did it. */
export async function notifyWidgetPublished(
  e: { firmId: string; widgetId: string; widgetTitle: string; modelId: string; modelTitle: string; number: number; checkState: string; actorId: string; actorName: string; republished: boolean },
  trx: Knex.Transaction,
): Promise<number> {
  const to = await listRecipients(e.firmId, NOTIFICATION_INFO.widget_published.roles, 'widget_published', [e.actorId], trx);
  const checked = e.checkState === 'signed_off' ? 'signed off by a checker' : 'not checked (your firm allows publishing unchecked versions)';
  for (const r of to) {
    await queue(
      trx,
      e.firmId,
      'widget_published',
      `${e.widgetId}:${e.number}`,
      r,
      `${e.republished ? 'Republished' : 'Published'}: ${e.widgetTitle}`,
      [
        `${e.actorName} ${e.republished ? 'moved the widget' : 'published the widget'} “${e.widgetTitle}” ${e.republished ? 'to' : 'from'} version ${e.number} of “${e.modelTitle}”.`,
        `That version is ${checked}. Clients with a pass to this widget see it on their next load.`,
      ],
      { label: 'Open the model', url: appUrl(`/app/models/${e.modelId}`) },
    );
  }
  return to.length;
}
