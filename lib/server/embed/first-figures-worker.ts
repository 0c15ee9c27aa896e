import 'server-only';
import { hostname } from 'node:os';
import { randomUUID } from 'node:crypto';
import { claimNextFirstFigures, extendFirstFiguresLease, firstFiguresModel, markFirstFiguresDone, markFirstFiguresFailed, markFirstFiguresRetry, type FirstFiguresJob } from '@/db/first-figures';
import { runForServer } from '@/lib/server/simulate/server-run';
import { encodeRunResult } from '@/lib/core/embed/first-figures';
import { backoffMs, startPollingLoop } from '@/lib/server/queue/loop';
import { engineBuild } from './first-figures';

// Computes queued first figures on the server's run pool, one job at a time, in the worker process beside the
// snapshot queue (lib/server/snapshots/worker-main.ts). The job row holds a lease while it runs; a worker that stops
// mid-run leaves the job to be taken again when the lease runs out, so a restart loses nothing. A job queued under
// another engine build (an older deployment) is left alone: that build's server reads it, this one queues its own.

export interface FirstFiguresWorkerOptions {
  id?: string;
  pollMs?: number;
  leaseMs?: number;
  retryBaseMs?: number;
  maxAttempts?: number;
  log?: (line: string) => void;
}

export interface FirstFiguresWorker {
  id: string;
  runOnce(): Promise<boolean>;
  stop(): Promise<void>;
}

export function firstFiguresOptionsFromEnv(e: NodeJS.ProcessEnv = process.env): FirstFiguresWorkerOptions {
  const n = (v: string | undefined) => (v && Number.isFinite(Number(v)) && Number(v) > 0 ? Number(v) : undefined);
  return { pollMs: n(e.FIRST_FIGURES_POLL_MS), leaseMs: n(e.FIRST_FIGURES_LEASE_MS) };
}

export function startFirstFiguresWorker(o: FirstFiguresWorkerOptions = {}): FirstFiguresWorker {
  const id = o.id ?? `${hostname()}:${process.pid}:ff-${randomUUID().slice(0, 8)}`;
  const pollMs = o.pollMs ?? 500;
  const leaseMs = o.leaseMs ?? 120_000;
  const base = o.retryBaseMs ?? 5000;
  const maxAttempts = o.maxAttempts ?? 3;
  const log = o.log ?? ((line: string) => console.log(`[first-figures] ${line}`));
  const until = () => new Date(Date.now() + leaseMs).toISOString();

  async function handle(job: FirstFiguresJob): Promise<void> {
    const beat = setInterval(() => void extendFirstFiguresLease(job.id, id, until()).catch(() => undefined), Math.max(200, Math.floor(leaseMs / 3)));
    try {
      const model = await firstFiguresModel(job);
      if (!model) {
        await markFirstFiguresFailed(job.id, id, 'The version no longer exists.');
        return;
      }
      if (job.engineBuild !== engineBuild()) {
        // Another deployment's job: hand it back for that build's workers (during a rolling deploy both run), and give
        // up on it after an hour, when no such worker is left. That build's pages then run the model in the browser.
        if (job.attempts > 6) await markFirstFiguresFailed(job.id, id, 'Queued under another engine build, which no worker computed.');
        else await markFirstFiguresRetry(job.id, id, 'Queued under another engine build.', new Date(Date.now() + 10 * 60_000).toISOString());
        return;
      }
      const t0 = performance.now();
      try {
        // No dial values: every dial at its default, which is what the viewer sees before moving one.
        const result = await runForServer(model, {});
        const ms = performance.now() - t0;
        if (await markFirstFiguresDone(job.id, id, encodeRunResult(result), ms)) log(`version ${job.versionId}: first figures computed in ${Math.round(ms)} ms`);
        else log(`version ${job.versionId}: lease lost before the result was stored; another worker has it`);
      } catch (err) {
        const msg = (err as Error).message.slice(0, 400);
        if (job.attempts >= maxAttempts) {
          await markFirstFiguresFailed(job.id, id, `Gave up after ${job.attempts} attempts: ${msg}`);
          log(`version ${job.versionId}: first figures failed after ${job.attempts} attempts: ${msg}`);
        } else {
          await markFirstFiguresRetry(job.id, id, msg, new Date(Date.now() + backoffMs(job.attempts, base, 15 * 60_000)).toISOString());
          log(`version ${job.versionId}: first figures attempt ${job.attempts} failed (${msg})`);
        }
      }
    } finally {
      clearInterval(beat);
    }
  }

  async function runOnce(): Promise<boolean> {
    const job = await claimNextFirstFigures(id, until());
    if (!job) return false;
    await handle(job);
    return true;
  }

  const loop = startPollingLoop({ runOnce, pollMs, log });
  return { id, runOnce, stop: () => loop.stop() };
}
