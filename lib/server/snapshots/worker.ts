import 'server-only';
import { hostname } from 'node:os';
import { randomUUID } from 'node:crypto';
import { claimNextJob, extendLease, getSnapshotContext, markFailed, markRetry, markSending, markSent, type SnapshotJob, type SnapshotState } from '@/db/snapshots';
import { renderSnapshot } from './render';
import { classifySendError, composeSnapshotMail, deliverSnapshotMail } from './mail';
import { backoffMs, startPollingLoop } from '@/lib/server/queue/loop';

// The snapshot worker: takes due jobs one at a time, renders, sends, and records every step in the job row.
// Crash safety: a job's lease (locked_until) is extended while the worker holds it; a job whose lease ran out in
// 'rendering' is taken again by any worker; one that ran out in 'sending' is settled as uncertain, never resent.

export interface WorkerOptions {
  id?: string;
  /** Idle poll interval. */
  pollMs?: number;
  /** How long a claim holds without a heartbeat. */
  leaseMs?: number;
  /** First retry delay; doubled per attempt up to `maxDelayMs`. */
  retryBaseMs?: number;
  maxDelayMs?: number;
  maxAttempts?: number;
  log?: (line: string) => void;
}

export interface SnapshotWorker {
  id: string;
  /** Processes one due job, if any; true when it took one. */
  runOnce(): Promise<boolean>;
  /** Stops polling and waits for the job in hand to finish. */
  stop(): Promise<void>;
}

export const UNCERTAIN_MESSAGE =
  'The worker stopped while the mail server was receiving this message, so it may have arrived. It is not sent again automatically, to avoid a duplicate.';

export { backoffMs };

export function workerOptionsFromEnv(e: NodeJS.ProcessEnv = process.env): WorkerOptions {
  const n = (v: string | undefined) => (v && Number.isFinite(Number(v)) && Number(v) > 0 ? Number(v) : undefined);
  return { pollMs: n(e.SNAPSHOT_POLL_MS), leaseMs: n(e.SNAPSHOT_LEASE_MS), retryBaseMs: n(e.SNAPSHOT_RETRY_BASE_MS), maxAttempts: n(e.SNAPSHOT_MAX_ATTEMPTS) };
}

export function startSnapshotWorker(o: WorkerOptions = {}): SnapshotWorker {
  const id = o.id ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const pollMs = o.pollMs ?? 1000;
  const leaseMs = o.leaseMs ?? 60_000;
  const base = o.retryBaseMs ?? 5000;
  const maxDelay = o.maxDelayMs ?? 15 * 60_000;
  const maxAttempts = o.maxAttempts ?? 10;
  const log = o.log ?? ((line: string) => console.log(`[snapshots] ${line}`));
  const until = () => new Date(Date.now() + leaseMs).toISOString();

  async function retryOrFail(job: SnapshotJob, from: SnapshotState, error: string): Promise<void> {
    if (job.attempts >= maxAttempts) {
      await markFailed(job.id, id, from, `Gave up after ${job.attempts} attempts: ${error}`);
      log(`job ${job.id} failed after ${job.attempts} attempts: ${error}`);
      return;
    }
    const delay = backoffMs(job.attempts, base, maxDelay);
    await markRetry(job.id, id, from, error, new Date(Date.now() + delay).toISOString());
    log(`job ${job.id} attempt ${job.attempts} failed (${error}); next in ${Math.round(delay / 1000)} s`);
  }

  async function handle(job: SnapshotJob): Promise<void> {
    let state: SnapshotState = 'rendering';
    const beat = setInterval(() => void extendLease(job.id, id, state, until()).catch(() => undefined), Math.max(200, Math.floor(leaseMs / 3)));
    try {
      const ctx = await getSnapshotContext(job.id);
      if (!ctx) {
        await markFailed(job.id, id, 'rendering', 'The widget, its version or the client no longer exists.');
        return;
      }
      let rendered;
      try {
        rendered = await renderSnapshot(ctx);
      } catch (err) {
        // The run and the layout are deterministic: a failure would fail again.
        await markFailed(job.id, id, 'rendering', `The PDF could not be made: ${(err as Error).message}`);
        log(`job ${job.id} render failed: ${(err as Error).stack ?? err}`);
        return;
      }
      const mail = composeSnapshotMail(job.recipient, rendered.content, job.createdAt);
      // From here the send is the one step never repeated blindly.
      if (!(await markSending(job.id, id, until(), { pdfBytes: rendered.pdf.length, renderMs: rendered.renderMs }))) {
        log(`job ${job.id}: lease lost before sending; another worker has it`);
        return;
      }
      state = 'sending';
      try {
        await deliverSnapshotMail(mail, rendered.pdf, job.messageId);
      } catch (err) {
        const kind = classifySendError(err);
        const msg = `Mail server: ${(err as Error).message}`.slice(0, 400);
        if (kind === 'retry') await retryOrFail(job, 'sending', msg);
        else if (kind === 'permanent') await markFailed(job.id, id, 'sending', `The mail server refused the message: ${(err as Error).message}`);
        else await markFailed(job.id, id, 'sending', `${UNCERTAIN_MESSAGE} (${msg})`);
        return;
      }
      await markSent(job.id, id);
      log(`job ${job.id} sent to ${job.recipient} (${rendered.pdf.length} bytes, rendered in ${rendered.renderMs} ms)`);
    } finally {
      clearInterval(beat);
    }
  }

  async function runOnce(): Promise<boolean> {
    const claimed = await claimNextJob(id, until());
    if (!claimed) return false;
    if (claimed.orphaned) {
      await markFailed(claimed.job.id, id, 'sending', UNCERTAIN_MESSAGE);
      log(`job ${claimed.job.id}: found in 'sending' after its worker stopped; settled as uncertain`);
      return true;
    }
    await handle(claimed.job);
    return true;
  }

  const loop = startPollingLoop({ runOnce, pollMs, log });

  return {
    id,
    runOnce,
    stop: () => loop.stop(),
  };
}
