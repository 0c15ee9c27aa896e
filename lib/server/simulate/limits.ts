import 'server-only';
import os from 'node:os';
import { z } from 'zod';

// Limits of server-side runs (common practice, no source: sized so the largest allowed run takes a few seconds on
// one core and a firm cannot take every thread). Each can be changed by an environment variable; README.md and
// /docs/model-json document them. Read once per process.

const int = (min: number, max: number) => z.coerce.number().int().min(min).max(max);

const schema = z.object({
  /** Trials × sampled columns of one run. */
  SIMULATE_MAX_WORK: int(1_000, 1_000_000_000).default(20_000_000),
  /** Wall-clock limit of one run on its thread; over it the thread is stopped. */
  SIMULATE_TIME_LIMIT_MS: int(100, 600_000).default(30_000),
  /** How long a run may wait for a thread (the queue, a thread starting); over it the run is dropped unstarted. */
  SIMULATE_MAX_WAIT_MS: int(100, 600_000).default(30_000),
  /** Worker threads; by default one fewer than the cores (at least one), so requests keep a core. */
  SIMULATE_THREADS: int(1, 64).optional(),
  /** Runs waiting for a thread, all firms together; beyond it the server answers 503 with Retry-After. */
  SIMULATE_MAX_QUEUE: int(0, 10_000).default(32),
  /** Runs in progress at once per API key (or signed-in member) and per firm. */
  SIMULATE_MAX_CONCURRENT_PER_KEY: int(1, 1_000).default(2),
  SIMULATE_MAX_CONCURRENT_PER_FIRM: int(1, 1_000).default(4),
  /** Runs started per minute per API key (or signed-in member) and per firm. */
  SIMULATE_RATE_PER_KEY: int(1, 100_000).default(60),
  SIMULATE_RATE_PER_FIRM: int(1, 100_000).default(120),
  /** Returned sample values (samples.limit × returned columns) per response. */
  SIMULATE_MAX_SAMPLE_VALUES: int(1, 100_000_000).default(2_000_000),
});

export interface RunLimits {
  maxWork: number;
  timeLimitMs: number;
  maxWaitMs: number;
  threads: number;
  maxQueue: number;
  concurrentPerKey: number;
  concurrentPerFirm: number;
  ratePerKey: number;
  ratePerFirm: number;
  /** The rate window: fixed minutes. */
  rateWindowMs: number;
  maxSampleValues: number;
}

let cached: RunLimits | null = null;

export function runLimits(): RunLimits {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    throw new Error(`Invalid environment:\n${parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n')}`);
  }
  const e = parsed.data;
  cached = {
    maxWork: e.SIMULATE_MAX_WORK,
    timeLimitMs: e.SIMULATE_TIME_LIMIT_MS,
    maxWaitMs: e.SIMULATE_MAX_WAIT_MS,
    threads: e.SIMULATE_THREADS ?? Math.max(1, os.availableParallelism() - 1),
    maxQueue: e.SIMULATE_MAX_QUEUE,
    concurrentPerKey: e.SIMULATE_MAX_CONCURRENT_PER_KEY,
    concurrentPerFirm: e.SIMULATE_MAX_CONCURRENT_PER_FIRM,
    ratePerKey: e.SIMULATE_RATE_PER_KEY,
    ratePerFirm: e.SIMULATE_RATE_PER_FIRM,
    rateWindowMs: 60_000,
    maxSampleValues: e.SIMULATE_MAX_SAMPLE_VALUES,
  };
  return cached;
}

/** Tests change the environment between files. */
export function resetRunLimits(): void {
  cached = null;
}
