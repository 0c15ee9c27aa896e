import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { RunResult } from '@/lib/core/engine';
import { runLimits } from './limits';
import type { RunFailure, RunTask } from './pool-worker';

// Every server-side run goes through this pool of worker threads (piscina), never the request thread: a big run
// of one firm leaves the event loop free for everyone else's requests. One pool per process.

/** The run passed its time limit; its thread was stopped (and replaced). */
export class RunTimeoutError extends Error {
  constructor(readonly limitMs: number) {
    super(`The run did not finish within ${limitMs / 1000} s and was stopped.`);
    this.name = 'RunTimeoutError';
  }
}

/** Every thread is busy and the queue is full, or the run waited too long for a thread. */
export class RunQueueFullError extends Error {
  constructor(readonly waitedMs: number | null = null) {
    super(waitedMs === null ? 'Every run thread is busy and the queue is full.' : `The run waited ${waitedMs / 1000} s for a thread and was dropped unstarted.`);
    this.name = 'RunQueueFullError';
  }
}

export type PoolReply = { ok: true; json: Uint8Array } | { ok: true; result: RunResult } | { ok: false; failure: RunFailure };

interface PoolState {
  pool: Piscina;
  file: string;
  /** Tasks handed to the pool and not yet settled (queued or running). */
  pending: number;
}

const g = globalThis as unknown as { __stochosRunPool?: PoolState };

/** The bundled worker (lib/server/simulate/build-worker.mjs); SIMULATE_WORKER_FILE points elsewhere (tests). */
export function workerFile(): string {
  // The worker is built beside .next at run time, so the file tracer must not follow these paths.
  return path.resolve(/*turbopackIgnore: true*/ process.env.SIMULATE_WORKER_FILE || path.join(/*turbopackIgnore: true*/ process.cwd(), '.next/workers/simulate-worker.mjs'));
}

function state(): PoolState {
  const file = workerFile();
  if (g.__stochosRunPool && g.__stochosRunPool.file === file) return g.__stochosRunPool;
  if (!fs.existsSync(/*turbopackIgnore: true*/ file)) throw new Error(`The run worker ${file} is missing: run \`npm run build\` (or node lib/server/simulate/build-worker.mjs).`);
  const l = runLimits();
  const pool = new Piscina({
    filename: pathToFileURL(file).href,
    minThreads: 1,
    maxThreads: l.threads,
    maxQueue: l.maxQueue,
    idleTimeout: 60_000,
    concurrentTasksPerWorker: 1,
  });
  g.__stochosRunPool = { pool, file, pending: 0 };
  return g.__stochosRunPool;
}

/**
 * Runs a task on the pool. The time limit counts from the moment the task has a thread (the worker says so through a
 * message port); waiting for a thread has its own limit. Past either, the task is aborted: piscina drops it from
 * the queue, or ends the thread running it and starts a fresh one.
 */
export async function runOnPool(task: RunTask, timeLimitMs = runLimits().timeLimitMs, maxWaitMs = runLimits().maxWaitMs): Promise<PoolReply> {
  const s = state();
  const controller = new AbortController();
  let overrun: 'wait' | 'run' | null = null;
  const abort = (why: 'wait' | 'run') => {
    overrun = why;
    controller.abort();
  };
  let runTimer: ReturnType<typeof setTimeout> | null = null;
  const waitTimer = setTimeout(() => abort('wait'), maxWaitMs);
  const { port1, port2 } = new MessageChannel();
  port1.once('message', () => {
    clearTimeout(waitTimer);
    runTimer = setTimeout(() => abort('run'), timeLimitMs);
  });
  port1.unref();
  s.pending++;
  try {
    const out = (await s.pool.run({ ...task, started: port2 }, { signal: controller.signal, transferList: [port2] })) as Uint8Array | PoolReply;
    // A JSON body arrives as bare bytes (moved, not copied).
    return out instanceof Uint8Array ? { ok: true, json: out } : out;
  } catch (err) {
    // piscina rejects an aborted task with its AbortError.
    if (overrun === 'run') throw new RunTimeoutError(timeLimitMs);
    if (overrun === 'wait') throw new RunQueueFullError(maxWaitMs);
    if (err instanceof Error && /queue is at limit/i.test(err.message)) throw new RunQueueFullError();
    throw err;
  } finally {
    clearTimeout(waitTimer);
    if (runTimer) clearTimeout(runTimer);
    port1.close();
    s.pending--;
  }
}

export interface PoolStats {
  /** Threads alive now (idle ones stop after a minute; one stays). */
  threads: number;
  maxThreads: number;
  /** Runs on a thread now. */
  running: number;
  /** Runs waiting for a thread. */
  queued: number;
}

export function poolStats(): PoolStats {
  const l = runLimits();
  const s = g.__stochosRunPool;
  if (!s) return { threads: 0, maxThreads: l.threads, running: 0, queued: 0 };
  const queued = s.pool.queueSize;
  return { threads: s.pool.threads.length, maxThreads: l.threads, running: Math.max(0, s.pending - queued), queued };
}

/** Stops the pool's threads (tests, shutdown). */
export async function closePool(): Promise<void> {
  const s = g.__stochosRunPool;
  g.__stochosRunPool = undefined;
  if (s) await s.pool.destroy();
}
