import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';
import { claimNext, leaseOps, transition } from '@/db/job-lease';
import type { Role } from '@/db/users';
import type { WaitingVersion } from '@/lib/core/api-types';
import type { NotificationKind } from '@/lib/core/notifications/kinds';

// Notification mails (migrations/20261203800100_notifications.ts) and each person's choices of which to receive.

export type MailJobState = 'queued' | 'claimed' | 'sending' | 'sent' | 'failed';

export interface MailJob {
  id: string;
  firmId: string;
  kind: NotificationKind;
  userId: string;
  recipient: string;
  subject: string;
  text: string;
  html: string;
  state: MailJobState;
  attempts: number;
  messageId: string;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
}

const COLUMNS = ['j.id', 'j.firm_id', 'j.kind', 'j.user_id', 'j.recipient', 'j.subject', 'j.text_body', 'j.html_body', 'j.state', 'j.attempts', 'j.message_id', 'j.last_error', 'j.created_at', 'j.sent_at'];

function toJob(r: Record<string, unknown>): MailJob {
  return {
    id: r.id as string,
    firmId: r.firm_id as string,
    kind: r.kind as NotificationKind,
    userId: r.user_id as string,
    recipient: r.recipient as string,
    subject: r.subject as string,
    text: r.text_body as string,
    html: r.html_body as string,
    state: r.state as MailJobState,
    attempts: Number(r.attempts),
    messageId: r.message_id as string,
    lastError: (r.last_error as string | null) ?? null,
    createdAt: r.created_at as string,
    sentAt: (r.sent_at as string | null) ?? null,
  };
}

export interface Recipient {
  userId: string;
  name: string;
  email: string;
}

/**
 * Active members of the firm with one of `roles` who have not turned `kind` off, minus `exceptUserIds`
 * (a version's author never receives the request to check it).
 */
export async function listRecipients(firmId: string, roles: readonly Role[], kind: NotificationKind, exceptUserIds: (string | null)[], trx: Knex.Transaction): Promise<Recipient[]> {
  const rows = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .leftJoin('notification_prefs as p', (j) => j.on('p.user_id', '=', 'm.user_id').andOn('p.kind', '=', trx.raw('?', [kind])))
    .where({ 'm.firm_id': firmId, 'm.status': 'active' })
    .whereIn('m.role', roles as Role[])
    .where((w) => w.whereNull('p.enabled').orWhere('p.enabled', true))
    .select('u.id', 'u.name', 'u.email')
    .orderBy('u.email');
  const except = new Set(exceptUserIds.filter(Boolean));
  return rows.filter((r) => !except.has(r.id)).map((r) => ({ userId: r.id, name: r.name, email: r.email }));
}

/** Whether one person receives `kind` (their own choice; on unless turned off). */
export async function wantsNotification(userId: string, kind: NotificationKind, trx: Knex.Transaction): Promise<boolean> {
  const r = await trx('notification_prefs').where({ user_id: userId, kind }).select('enabled').first();
  return r ? Boolean(r.enabled) : true;
}

export interface NewMailJob {
  firmId: string;
  kind: NotificationKind;
  userId: string;
  recipient: string;
  subject: string;
  text: string;
  html: string;
  dedupeKey: string;
}

/** Queues a mail in the caller's transaction; a second insert with the same key is ignored. */
export async function insertMailJob(j: NewMailJob, trx: Knex.Transaction): Promise<void> {
  const now = nowIso();
  const id = newId();
  await trx('mail_jobs')
    .insert({
      id,
      firm_id: j.firmId,
      kind: j.kind,
      user_id: j.userId,
      recipient: j.recipient,
      subject: j.subject.slice(0, 300),
      text_body: j.text,
      html_body: j.html,
      dedupe_key: j.dedupeKey,
      state: 'queued',
      attempts: 0,
      next_attempt_at: now,
      message_id: `<${id}@notifications.stochos>`,
      created_at: now,
      updated_at: now,
    })
    .onConflict('dedupe_key')
    .ignore();
}

const ops = leaseOps('mail_jobs');

export async function claimNextMailJob(workerId: string, leaseUntil: string, now = nowIso()): Promise<{ job: MailJob; orphaned: boolean } | null> {
  const c = await claimNext({ table: 'mail_jobs', workState: 'claimed' }, COLUMNS, workerId, leaseUntil, now);
  return c ? { job: toJob(c.row), orphaned: c.orphaned } : null;
}

export const markMailSending = (id: string, workerId: string, until: string) => transition('mail_jobs', id, workerId, 'claimed', { state: 'sending', locked_until: until });
export const markMailSent = ops.markSent;
export const markMailRetry = ops.markRetry;
export const markMailFailed = ops.markFailed;
export const extendMailLease = ops.extendLease;

export async function getMailJob(id: string): Promise<MailJob | null> {
  const r = await getDb()('mail_jobs as j').where('j.id', id).select(COLUMNS).first();
  return r ? toJob(r) : null;
}

export async function listMailJobs(firmId: string, limit = 200): Promise<MailJob[]> {
  const rows = await getDb()('mail_jobs as j').where('j.firm_id', firmId).select(COLUMNS).orderBy('j.created_at', 'desc').limit(limit);
  return rows.map(toJob);
}

/** The stored choices of one person, as rows; kinds with no row are on (the service fills them in). */
export async function getNotificationPrefRows(userId: string): Promise<{ kind: string; enabled: boolean }[]> {
  const rows = await getDb()('notification_prefs').where({ user_id: userId }).select('kind', 'enabled');
  return rows.map((r) => ({ kind: r.kind as string, enabled: Boolean(r.enabled) }));
}

export async function setNotificationPrefs(userId: string, prefs: Partial<Record<NotificationKind, boolean>>, trx: Knex.Transaction): Promise<void> {
  const now = nowIso();
  for (const [kind, enabled] of Object.entries(prefs)) {
    if (enabled === undefined) continue;
    await trx('notification_prefs').insert({ user_id: userId, kind, enabled, updated_at: now }).onConflict(['user_id', 'kind']).merge({ enabled, updated_at: now });
  }
}

/** Unchecked versions of live (not archived) models in the firm that `userId` did not write: what waits for them. */
export async function listVersionsAwaitingCheck(firmId: string, userId: string): Promise<WaitingVersion[]> {
  const rows = await getDb()('model_versions as v')
    .join('models as m', 'm.id', 'v.model_id')
    .leftJoin('users as u', 'u.id', 'v.author_id')
    .where({ 'v.firm_id': firmId, 'm.firm_id': firmId, 'v.check_state': 'unchecked' })
    .whereNull('m.archived_at')
    .where((w) => w.whereNull('v.author_id').orWhereNot('v.author_id', userId))
    .select('v.model_id', 'm.title', 'v.number', 'u.name as author_name', 'v.note', 'v.created_at')
    .orderBy('v.created_at', 'asc')
    .limit(200);
  return rows.map((r) => ({ modelId: r.model_id, modelTitle: r.title, number: Number(r.number), authorName: r.author_name ?? null, note: r.note ?? null, createdAt: r.created_at }));
}
