import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { claimNext, leaseOps, transition } from '@/db/job-lease';
import { nowIso } from '@/db/ids';
import { storedModel } from '@/db/models';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

// Snapshot jobs (migrations/20261201000600_snapshots.ts). The worker's state changes are conditional on the
// job's current state and lease holder, so two workers can never both move the same job forward.

import type { SnapshotListRow, SnapshotState } from '@/lib/core/api-types';

export type { SnapshotListRow, SnapshotState };

export interface SnapshotJob {
  id: string;
  firmId: string;
  clientId: string;
  passId: string;
  widgetId: string;
  versionId: string;
  recipient: string;
  dialValues: Record<string, number>;
  /** A second, pinned view to show beside the first; null for a single view. */
  pinnedDialValues: Record<string, number> | null;
  state: SnapshotState;
  attempts: number;
  nextAttemptAt: string;
  lockedBy: string | null;
  lockedUntil: string | null;
  messageId: string;
  lastError: string | null;
  pdfBytes: number | null;
  renderMs: number | null;
  createdAt: string;
  updatedAt: string;
  sentAt: string | null;
}

const COLUMNS = [
  'j.id',
  'j.firm_id',
  'j.client_id',
  'j.pass_id',
  'j.widget_id',
  'j.version_id',
  'j.recipient',
  'j.dial_values',
  'j.pinned_dial_values',
  'j.state',
  'j.attempts',
  'j.next_attempt_at',
  'j.locked_by',
  'j.locked_until',
  'j.message_id',
  'j.last_error',
  'j.pdf_bytes',
  'j.render_ms',
  'j.created_at',
  'j.updated_at',
  'j.sent_at',
];

function toJob(r: Record<string, unknown>): SnapshotJob {
  return {
    id: r.id as string,
    firmId: r.firm_id as string,
    clientId: r.client_id as string,
    passId: r.pass_id as string,
    widgetId: r.widget_id as string,
    versionId: r.version_id as string,
    recipient: r.recipient as string,
    dialValues: JSON.parse(r.dial_values as string) as Record<string, number>,
    pinnedDialValues: r.pinned_dial_values ? (JSON.parse(r.pinned_dial_values as string) as Record<string, number>) : null,
    state: r.state as SnapshotState,
    attempts: Number(r.attempts),
    nextAttemptAt: r.next_attempt_at as string,
    lockedBy: (r.locked_by as string | null) ?? null,
    lockedUntil: (r.locked_until as string | null) ?? null,
    messageId: r.message_id as string,
    lastError: (r.last_error as string | null) ?? null,
    pdfBytes: r.pdf_bytes == null ? null : Number(r.pdf_bytes),
    renderMs: r.render_ms == null ? null : Number(r.render_ms),
    createdAt: r.created_at as string,
    updatedAt: r.updated_at as string,
    sentAt: (r.sent_at as string | null) ?? null,
  };
}

export interface NewSnapshotJob {
  id: string;
  firmId: string;
  clientId: string;
  passId: string;
  widgetId: string;
  versionId: string;
  recipient: string;
  requesterHash: string;
  dialValues: Record<string, number>;
  pinnedDialValues?: Record<string, number> | null;
  messageId: string;
  createdAt: string;
}

export async function insertSnapshotJob(j: NewSnapshotJob, trx: Knex.Transaction): Promise<void> {
  await trx('snapshot_jobs').insert({
    id: j.id,
    firm_id: j.firmId,
    client_id: j.clientId,
    pass_id: j.passId,
    widget_id: j.widgetId,
    version_id: j.versionId,
    recipient: j.recipient,
    requester_hash: j.requesterHash,
    dial_values: JSON.stringify(j.dialValues),
    pinned_dial_values: j.pinnedDialValues ? JSON.stringify(j.pinnedDialValues) : null,
    state: 'queued',
    attempts: 0,
    next_attempt_at: j.createdAt,
    message_id: j.messageId,
    created_at: j.createdAt,
    updated_at: j.createdAt,
  });
}

export type RateKey = { recipient: string } | { passId: string } | { requesterHash: string };

/** Requests counted against a limit since `sinceIso`, and the oldest of them (it decides when a slot frees up). */
export async function countRequestsSince(key: RateKey, sinceIso: string, trx: Knex.Transaction): Promise<{ count: number; oldest: string | null }> {
  const q = trx('snapshot_jobs').where('created_at', '>=', sinceIso);
  if ('recipient' in key) q.where('recipient', key.recipient);
  else if ('passId' in key) q.where('pass_id', key.passId);
  else q.where('requester_hash', key.requesterHash);
  const r = (await q.count({ n: '*' }).min({ oldest: 'created_at' }).first()) as { n: number; oldest: string | null } | undefined;
  return { count: Number(r?.n ?? 0), oldest: r?.oldest ?? null };
}

export async function getSnapshotJob(id: string, trx?: Knex.Transaction): Promise<SnapshotJob | null> {
  const r = await (trx ?? getDb())('snapshot_jobs as j').where('j.id', id).select(COLUMNS).first();
  return r ? toJob(r) : null;
}

const ops = leaseOps('snapshot_jobs');

/**
 * Takes the next due job for `workerId` with a lease until `leaseUntil`. A job whose worker stopped while rendering
 * (lease run out) is taken again; one whose worker stopped while the mail server was receiving it is returned in
 * state 'sending' with `orphaned: true`, for the caller to settle without sending it again.
 */
export async function claimNextJob(workerId: string, leaseUntil: string, now = nowIso()): Promise<{ job: SnapshotJob; orphaned: boolean } | null> {
  const c = await claimNext({ table: 'snapshot_jobs', workState: 'rendering' }, COLUMNS, workerId, leaseUntil, now);
  return c ? { job: toJob(c.row), orphaned: c.orphaned } : null;
}

export const extendLease = (id: string, workerId: string, state: SnapshotState, until: string) => ops.extendLease(id, workerId, state, until);

export const markSending = (id: string, workerId: string, until: string, render: { pdfBytes: number; renderMs: number }) =>
  transition('snapshot_jobs', id, workerId, 'rendering', { state: 'sending', locked_until: until, pdf_bytes: render.pdfBytes, render_ms: render.renderMs });

export const markSent = (id: string, workerId: string) => ops.markSent(id, workerId);

export const markRetry = (id: string, workerId: string, from: SnapshotState, error: string, nextAttemptAt: string) => ops.markRetry(id, workerId, from, error, nextAttemptAt);

export const markFailed = (id: string, workerId: string, from: SnapshotState, error: string) => ops.markFailed(id, workerId, from, error);

/** Everything the renderer needs about a job: the pinned version, the widget's presentation, firm and client. */
export interface SnapshotContext {
  job: SnapshotJob;
  model: CheckedModel;
  versionNumber: number;
  versionCreatedAt: string;
  checkState: 'unchecked' | 'signed_off' | 'sent_back';
  checkedAt: string | null;
  checkerName: string | null;
  authorName: string | null;
  widget: { title: string; panels: string[]; headline: string; dialIds: string[]; brandColor: string; showLogo: boolean };
  firm: { name: string; brandColor: string; paperSize: 'A4' | 'Letter' };
  clientName: string;
}

export async function getSnapshotContext(jobId: string): Promise<SnapshotContext | null> {
  const job = await getSnapshotJob(jobId);
  if (!job) return null;
  const r = await getDb()('model_versions as v')
    .join('widgets as w', (j) => j.on('w.id', '=', getDb().raw('?', [job.widgetId])))
    .join('firms as f', 'f.id', 'v.firm_id')
    .join('clients as c', (j) => j.on('c.id', '=', getDb().raw('?', [job.clientId])))
    .leftJoin('users as au', 'au.id', 'v.author_id')
    .leftJoin('users as cu', 'cu.id', 'v.checker_id')
    .where({ 'v.id': job.versionId, 'v.firm_id': job.firmId, 'w.firm_id': job.firmId, 'c.firm_id': job.firmId })
    .select(
      'v.model_json',
      'v.number',
      'v.created_at as version_created_at',
      'v.check_state',
      'v.checked_at',
      'au.name as author_name',
      'cu.name as checker_name',
      'w.title',
      'w.panels',
      'w.headline',
      'w.dial_ids',
      'w.brand_color',
      'w.show_logo',
      'f.name as firm_name',
      'f.brand_color as firm_brand_color',
      'f.paper_size',
      'c.name as client_name',
    )
    .first();
  if (!r) return null;
  return {
    job,
    model: storedModel(r.model_json as string),
    versionNumber: Number(r.number),
    versionCreatedAt: r.version_created_at as string,
    checkState: r.check_state,
    checkedAt: r.checked_at ?? null,
    checkerName: r.checker_name ?? null,
    authorName: r.author_name ?? null,
    widget: { title: r.title, panels: JSON.parse(r.panels), headline: r.headline, dialIds: JSON.parse(r.dial_ids), brandColor: r.brand_color, showLogo: Boolean(r.show_logo) },
    firm: { name: r.firm_name, brandColor: r.firm_brand_color, paperSize: r.paper_size === 'Letter' ? 'Letter' : 'A4' },
    clientName: r.client_name,
  };
}


export async function listSnapshotJobs(firmId: string, opts: { clientId?: string; limit?: number } = {}): Promise<SnapshotListRow[]> {
  const q = getDb()('snapshot_jobs as j')
    .join('clients as c', 'c.id', 'j.client_id')
    .join('widgets as w', 'w.id', 'j.widget_id')
    .where('j.firm_id', firmId)
    .select('j.id', 'j.created_at', 'j.client_id', 'c.name as client_name', 'j.widget_id', 'w.title as widget_title', 'j.recipient', 'j.state', 'j.attempts', 'j.last_error', 'j.sent_at')
    .orderBy('j.created_at', 'desc')
    .orderBy('j.id')
    .limit(opts.limit ?? 500);
  if (opts.clientId) q.where('j.client_id', opts.clientId);
  return (await q).map((r: Record<string, unknown>) => ({
    id: r.id as string,
    createdAt: r.created_at as string,
    clientId: r.client_id as string,
    clientName: r.client_name as string,
    widgetId: r.widget_id as string,
    widgetTitle: r.widget_title as string,
    recipient: r.recipient as string,
    state: r.state as SnapshotState,
    attempts: Number(r.attempts),
    lastError: (r.last_error as string | null) ?? null,
    sentAt: (r.sent_at as string | null) ?? null,
  }));
}
