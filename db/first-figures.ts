import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { claimNext, leaseOps, transition } from '@/db/job-lease';
import { newId, nowIso } from '@/db/ids';
import { storedModel } from '@/db/models';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

// First figures of published versions (migrations/20261205200100_first_figures.ts): one row per version and engine
// build, which is both the stored result and the job that computes it. Every read is scoped by firm.

export type FirstFiguresState = 'queued' | 'computing' | 'done' | 'failed';

export interface FirstFiguresJob {
  id: string;
  firmId: string;
  versionId: string;
  engineBuild: string;
  state: FirstFiguresState;
  attempts: number;
}

export interface StoredFirstFigures {
  /** The RunResult as stored (lib/core/embed/first-figures.ts encoding), sent on as text. */
  resultJson: string;
  computedAt: string;
}

const JOB_COLUMNS = ['j.id', 'j.firm_id', 'j.version_id', 'j.engine_build', 'j.state', 'j.attempts'];

const toJob = (r: Record<string, unknown>): FirstFiguresJob => ({
  id: r.id as string,
  firmId: r.firm_id as string,
  versionId: r.version_id as string,
  engineBuild: r.engine_build as string,
  state: r.state as FirstFiguresState,
  attempts: Number(r.attempts),
});

/**
 * Queues the computation for a version of the firm unless a row for it and this engine build exists (done, queued
 * or failed alike). Safe to call twice and from concurrent requests. The version must belong to the firm.
 */
export async function enqueueFirstFigures(firmId: string, versionId: string, engineBuild: string, trx?: Knex.Transaction): Promise<void> {
  const db = trx ?? getDb();
  const owned = await db('model_versions').where({ firm_id: firmId, id: versionId }).first('id');
  if (!owned) return;
  const now = nowIso();
  await db('first_figures')
    .insert({ id: newId(), firm_id: firmId, version_id: versionId, engine_build: engineBuild, state: 'queued', attempts: 0, next_attempt_at: now, created_at: now, updated_at: now })
    .onConflict(['version_id', 'engine_build'])
    .ignore();
}

/** The row of a version of the firm for this engine build: its state, and the stored result once done. */
export async function readFirstFigures(firmId: string, versionId: string, engineBuild: string): Promise<{ state: FirstFiguresState; stored: StoredFirstFigures | null } | null> {
  const r = await getDb()('first_figures').where({ firm_id: firmId, version_id: versionId, engine_build: engineBuild }).first('state', 'result_json', 'computed_at');
  if (!r) return null;
  const state = r.state as FirstFiguresState;
  return { state, stored: state === 'done' && typeof r.result_json === 'string' ? { resultJson: r.result_json, computedAt: r.computed_at as string } : null };
}

/** Takes the next due job with a lease; a job whose worker stopped while computing is taken again when its lease ran out. */
export async function claimNextFirstFigures(workerId: string, leaseUntil: string, now = nowIso()): Promise<FirstFiguresJob | null> {
  const c = await claimNext({ table: 'first_figures', workState: 'computing' }, JOB_COLUMNS, workerId, leaseUntil, now);
  return c ? toJob(c.row) : null;
}

/** The checked model of the job's version (scoped by the job's firm), or null when the version is gone. */
export async function firstFiguresModel(job: Pick<FirstFiguresJob, 'firmId' | 'versionId'>): Promise<CheckedModel | null> {
  const r = await getDb()('model_versions').where({ firm_id: job.firmId, id: job.versionId }).first('model_json');
  return r ? storedModel(r.model_json as string) : null;
}

const ops = leaseOps('first_figures');

export const extendFirstFiguresLease = (id: string, workerId: string, until: string) => ops.extendLease(id, workerId, 'computing', until);

export const markFirstFiguresDone = (id: string, workerId: string, resultJson: string, runMs: number) =>
  transition('first_figures', id, workerId, 'computing', { state: 'done', result_json: resultJson, computed_at: nowIso(), run_ms: Math.round(runMs), locked_by: null, locked_until: null, last_error: null });

export const markFirstFiguresRetry = (id: string, workerId: string, error: string, nextAttemptAt: string) => ops.markRetry(id, workerId, 'computing', error, nextAttemptAt);

export const markFirstFiguresFailed = (id: string, workerId: string, error: string) => ops.markFailed(id, workerId, 'computing', error);

/** For tests and the operator: a version's rows (all builds), newest first. */
export async function listFirstFigures(firmId: string, versionId: string): Promise<{ engineBuild: string; state: FirstFiguresState; attempts: number; computedAt: string | null; runMs: number | null; lastError: string | null }[]> {
  const rows = await getDb()('first_figures')
    .where({ firm_id: firmId, version_id: versionId })
    .orderBy('created_at', 'desc')
    .select('engine_build', 'state', 'attempts', 'computed_at', 'run_ms', 'last_error');
  return rows.map((r) => ({ engineBuild: r.engine_build, state: r.state, attempts: Number(r.attempts), computedAt: r.computed_at ?? null, runMs: r.run_ms === null || r.run_ms === undefined ? null : Number(r.run_ms), lastError: r.last_error ?? null }));
}
